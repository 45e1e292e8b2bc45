import type { Route } from "./+types/api.records-requests";
import { requireCapability } from "~/lib/access.server";
import { apiError } from "~/lib/http.server";
import { queueQueryOf } from "~/lib/records/queue-query";
import { listRecordsRequests } from "~/models/records-request.server";

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "records.manage");
  const { query, problems } = queueQueryOf(new URL(request.url));
  if (Object.keys(problems).length) apiError(400, "Some filters cannot be used.", { errors: problems });
  const items = await listRecordsRequests(query);
  return Response.json({
    items: items.map((item) => ({
      id: item.id,
      trackingCode: item.trackingCode,
      status: item.status,
      receivedAt: item.receivedAt,
      dueOn: item.dueOn,
      daysLeft: item.daysLeft,
      urgency: item.urgency,
      assignee: item.assignee,
    })),
  });
}
