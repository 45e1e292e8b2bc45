import { parseWithZod } from "@conform-to/zod/v4";
import { data, redirect } from "react-router";
import type { Route } from "./+types/events.$id.notifications";
import { authorize, requireCapability } from "~/lib/access.server";
import { ReleaseNotificationSchema } from "~/lib/foam/notification-schema";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress, httpError, invariantResponse, requireRecordId } from "~/lib/http.server";
import { flashHeaders } from "~/lib/session.server";
import { reportAccessRecord } from "~/models/event-read.server";
import { recordReleaseNotification } from "~/models/release-notification.server";

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "report.notify");
  httpError(405, "Record a notification from the event page.");
}

/** Records who was notified of this event's release. The record itself notifies no one. */
export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "report.notify");
  const eventId = requireRecordId(request, params.id, "No such report.");
  const record = await reportAccessRecord(eventId);
  invariantResponse(record, "No such report.");
  authorize(request, user, "report.notify", record);
  const submission = parseWithZod(await readFormData(request, ReleaseNotificationSchema), {
    schema: ReleaseNotificationSchema,
  });
  if (submission.status !== "success") return data({ notification: submission.reply() }, { status: 400 });
  await recordReleaseNotification({ eventId, value: submission.value, user, clientAddress: clientAddress(request) });
  throw redirect(`/events/${eventId}#notifications`, {
    headers: await flashHeaders(request, "Notification recorded."),
  });
}
