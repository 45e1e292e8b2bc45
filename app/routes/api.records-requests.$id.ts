import type { Route } from "./+types/api.records-requests.$id";
import { requireCapability } from "~/lib/access.server";
import { apiError, requireRecordId } from "~/lib/http.server";
import { getRecordsRequest } from "~/models/records-request.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  await requireCapability(request, "records.manage");
  const found = await getRecordsRequest(requireRecordId(request, params.id, "Not found."));
  if (!found) apiError(404, "Not found.");
  return Response.json(found);
}
