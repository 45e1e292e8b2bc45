import type { Route } from "./+types/api.records-requests.$id";
import { requireCapability } from "~/lib/access.server";
import { apiError } from "~/lib/http.server";
import { getRecordsRequest } from "~/models/records-request.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  await requireCapability(request, "records.manage");
  const id = Number(params.id);
  const found = Number.isInteger(id) && id > 0 ? await getRecordsRequest(id) : null;
  if (!found) apiError(404, "Not found.");
  return Response.json(found);
}
