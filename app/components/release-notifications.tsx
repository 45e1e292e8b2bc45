import { getFormProps, useForm, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useFetcher } from "react-router";
import type { z } from "zod";
import { FormErrors, SelectField, TextAreaField, TextField } from "~/components/form-fields";
import { ReleaseNotificationSchema } from "~/lib/foam/notification-schema";
import { NOTIFIED_PARTIES, NOTIFIED_PARTY_LABELS } from "~/lib/foam/vocabulary";

export type NotificationEntry = {
  id: number;
  partyLabel: string;
  partyDetail: string;
  notifiedAt: string;
  notifiedBy: string;
  caseNumber: string;
  notes: string;
};

/** Who was notified of this event's release; the record itself is not a notification. */
export function ReleaseNotifications({
  eventId,
  notifications,
  canRecord,
  timeZone,
}: {
  eventId: number;
  notifications: NotificationEntry[];
  canRecord: boolean;
  timeZone: string;
}) {
  const fetcher = useFetcher<{ notification?: SubmissionResult<string[]> }>();
  const [form, fields] = useForm<z.input<typeof ReleaseNotificationSchema>>({
    id: "release-notification",
    lastResult: fetcher.state === "idle" ? fetcher.data?.notification : undefined,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: ReleaseNotificationSchema }),
    shouldValidate: "onBlur",
  });
  return (
    <section id="notifications" className="card space-y-3" aria-labelledby="notifications-title">
      <h2 id="notifications-title" className="text-lg font-semibold">
        Notifications of this release
      </h2>
      <p className="caution" role="note">
        This report is not a notification. A release at or above a reportable quantity must be reported immediately once
        known (CERCLA §103, EPCRA §304; 40 CFR 302.6(a), 355.40); many states add their own notice, e.g. Colorado within
        24 hours (C.R.S. 25-5-1303.5). Record here who was told, when and the case number they gave.
      </p>
      {notifications.length === 0 ? (
        <p data-testid="no-notifications">No notification recorded.</p>
      ) : (
        <table className="w-full text-sm" data-testid="notifications">
          <thead>
            <tr>
              <th scope="col">Notified</th>
              <th scope="col">When ({timeZone})</th>
              <th scope="col">By</th>
              <th scope="col">Case or report number</th>
              <th scope="col">Notes</th>
            </tr>
          </thead>
          <tbody>
            {notifications.map((entry) => (
              <tr key={entry.id}>
                <td>
                  {entry.partyLabel}
                  {entry.partyDetail ? ` — ${entry.partyDetail}` : ""}
                </td>
                <td>{entry.notifiedAt.replace("T", " ")}</td>
                <td>{entry.notifiedBy}</td>
                <td>{entry.caseNumber || "—"}</td>
                <td className="whitespace-pre-line">{entry.notes}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {canRecord ? (
        <fetcher.Form
          method="post"
          action={`/events/${eventId}/notifications`}
          {...getFormProps(form)}
          className="grid gap-3 sm:grid-cols-2"
        >
          <div className="sm:col-span-2">
            <FormErrors id={form.errorId} errors={form.errors} />
          </div>
          <SelectField
            label="Who was notified"
            field={fields.party}
            placeholder="Choose"
            options={NOTIFIED_PARTIES.map((party) => ({ value: party, label: NOTIFIED_PARTY_LABELS[party] }))}
          />
          <TextField label="Which office (for Other)" field={fields.partyDetail} />
          <TextField label={`When (${timeZone})`} field={fields.notifiedAt} type="datetime-local" />
          <TextField label="Notified by" field={fields.notifiedBy} />
          <TextField label="Case or report number" field={fields.caseNumber} />
          <TextAreaField label="Notes" field={fields.notes} />
          <div className="sm:col-span-2">
            <button type="submit" className="btn-secondary">
              Record notification
            </button>
          </div>
        </fetcher.Form>
      ) : null}
    </section>
  );
}
