import type { Route } from "./+types/api.records-requests";
import { requireCapability } from "~/lib/access.server";
import { queueQueryOf } from "~/lib/records/queue-query";
import { listRecordsRequests } from "~/models/records-request.server";

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "records.manage");
  const items = await listRecordsRequests(queueQueryOf(new URL(request.url)));
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
