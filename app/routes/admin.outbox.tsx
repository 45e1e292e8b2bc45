import { data, Form } from "react-router";
import type { Route } from "./+types/admin.outbox";
import { requireCapability } from "~/lib/access.server";
import { env } from "~/lib/env.server";
import { fakeMailDirectory, readFakeMailbox, smtpPort } from "~/lib/fake-mailbox.server";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress, httpError } from "~/lib/http.server";
import { recordIdOf } from "~/lib/record-id";
import { recordDownload } from "~/models/download-audit.server";
import { deliverPendingMail, discardMail, listOutbox, retryMailNow } from "~/models/mail-outbox.server";

export const meta: Route.MetaFunction = () => [{ title: "Outbox (demo) · Foamtally" }];

function requireDemoMode() {
  if (!env().DEMO_MODE) httpError(404, "The outbox is shown in demo mode only.");
}

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "outbox.view");
  requireDemoMode();
  const port = smtpPort(env().SMTP_URL);
  const [queue, received] = await Promise.all([listOutbox(), readFakeMailbox(fakeMailDirectory(port))]);
  return { queue, received, smtpUrl: env().SMTP_URL };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireCapability(request, "outbox.view");
  requireDemoMode();
  const formData = await readFormData(request, [], { fields: ["intent", "id"] });
  const intent = formData.get("intent");
  const actor = { id: user.id, email: user.email, clientAddress: clientAddress(request) };
  if (intent === "retry" || intent === "discard") {
    const id = recordIdOf(formData.get("id"));
    const changed = id != null && (await (intent === "retry" ? retryMailNow : discardMail)(id, actor));
    if (!changed) return data({ message: "That message is not waiting or failed." }, { status: 400 });
    if (intent === "discard") return { message: "The message was discarded; it stays listed and will not be sent." };
  }
  const outcome = await deliverPendingMail();
  await recordDownload(request, user, {
    action: "outbox_delivery_run",
    entityType: "mail_outbox",
    summary: "Sent what was due from the outbox",
    details: outcome,
  });
  return { message: `Sent ${outcome.sent}; ${outcome.retrying} will be retried; ${outcome.failed} failed for good.` };
}

const when = (value: Date | string | null) =>
  value ? new Date(value).toISOString().slice(0, 19).replace("T", " ") + " UTC" : "";

export default function Outbox({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-bold">Outbox (demo mode)</h1>
      <p className="caution">
        Demo mode: mail goes to the local fake SMTP server at {loaderData.smtpUrl}, which keeps every message and
        delivers none. Release alerts, returned-report notices and quarterly workbooks appear below.
      </p>
      {actionData ? <p role="status">{actionData.message}</p> : null}
      <section className="card overflow-x-auto" aria-labelledby="queue-title">
        <div className="flex flex-wrap items-center justify-between gap-3">
          <h2 id="queue-title" className="text-lg font-semibold">
            Queue
          </h2>
          <Form method="post">
            <input type="hidden" name="intent" value="deliver" />
            <button type="submit" className="btn-secondary">
              Send what is due now
            </button>
          </Form>
        </div>
        <div className="table-scroll mt-3">
          <table className="data-table">
            <thead>
              <tr>
                <th scope="col">Queued</th>
                <th scope="col">Kind</th>
                <th scope="col">To</th>
                <th scope="col">Subject</th>
                <th scope="col">Status</th>
                <th scope="col">Attempts</th>
                <th scope="col">Last error / next attempt</th>
                <th scope="col">
                  <span className="sr-only">Retry or discard</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {loaderData.queue.map((row) => (
                <tr key={row.id}>
                  <td>{when(row.createdAt)}</td>
                  <td>{row.kind.replace(/_/g, " ")}</td>
                  <td className="break-all">{row.to}</td>
                  <td>
                    {row.subject}
                    {row.attachmentName ? (
                      <span className="block text-xs text-slate-ft">Attachment: {row.attachmentName}</span>
                    ) : null}
                  </td>
                  <td className={row.status === "failed" ? "font-semibold text-danger-700" : undefined}>
                    {row.status}
                  </td>
                  <td>{row.attempts}</td>
                  <td className="text-sm">
                    {row.lastError ? <span className="block text-danger-700">{row.lastError}</span> : null}
                    {row.status === "queued"
                      ? `next: ${when(row.nextAttemptAt)}`
                      : row.sentAt
                        ? `sent ${when(row.sentAt)}`
                        : ""}
                  </td>
                  <td>
                    {row.status === "queued" || row.status === "failed" ? (
                      <div className="flex gap-2">
                        <Form method="post">
                          <input type="hidden" name="intent" value="retry" />
                          <input type="hidden" name="id" value={row.id} />
                          <button type="submit" className="btn-quiet">
                            Retry now
                          </button>
                        </Form>
                        <Form method="post">
                          <input type="hidden" name="intent" value="discard" />
                          <input type="hidden" name="id" value={row.id} />
                          <button type="submit" className="btn-quiet">
                            Discard
                          </button>
                        </Form>
                      </div>
                    ) : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        {loaderData.queue.length === 0 ? <p className="mt-2">Nothing has been queued yet.</p> : null}
      </section>
      <section className="card space-y-4" aria-labelledby="received-title">
        <h2 id="received-title" className="text-lg font-semibold">
          Received by the fake SMTP server
        </h2>
        {loaderData.received.length === 0 ? <p>No messages yet.</p> : null}
        {loaderData.received.map((message) => (
          <article key={message.id} className="rounded-md border border-stone-200 p-3 [overflow-wrap:anywhere]">
            <h3 className="font-semibold">{message.subject}</h3>
            <p className="text-sm text-slate-ft">
              {when(message.receivedAt)} · to {message.envelopeTo.join(", ")}
            </p>
            {message.attachments.map((attachment) => (
              <p key={attachment.sha256} className="text-sm">
                Attachment: {attachment.filename} ({attachment.size.toLocaleString("en-US")} bytes, SHA-256{" "}
                {attachment.sha256.slice(0, 16)}…)
              </p>
            ))}
            <div className="mt-2 font-sans text-sm whitespace-pre-wrap" data-testid="mail-text">
              {message.text}
            </div>
          </article>
        ))}
      </section>
    </div>
  );
}
