import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, useActionData, useLoaderData } from "react-router";
import type { Route } from "./+types/records.$id";
import { RequestAttachments } from "~/components/attachments-panel";
import { requireCapability } from "~/lib/access.server";
import {
  EVENT_KIND_LABELS,
  EVENT_KINDS,
  FOAM_CLASS_LABELS,
  FOAM_CLASSES,
  RECORDS_REQUEST_STATUS_LABELS,
  RECORDS_REQUEST_STATUSES,
} from "~/lib/foam/vocabulary";
import { readFormData } from "~/lib/form-data.server";
import { invariantResponse, requireRecordId } from "~/lib/http.server";
import { RequestChangeSchema } from "~/lib/records/queue-query";
import { BuildPackageSchema, ReleaseSelectionSchema, SendPackageSchema } from "~/lib/records/release-selection";
import {
  buildReleasePackage,
  PackageRefused,
  type ReleaseSelection,
  selectReleaseEvents,
  sendReleasePackage,
} from "~/exports/release-package.server";
import { deliverPendingMailSoon } from "~/models/mail-outbox.server";
import {
  changeRecordsRequest,
  getRecordsRequest,
  listRecordsAssignees,
  RequestChangeRefused,
} from "~/models/records-request.server";

export const meta: Route.MetaFunction = ({ data: loaded }) => [
  { title: `${loaded?.request.trackingCode ?? "Request"} · Public-records requests · Foamtally` },
];

type SelectionInput = ReturnType<typeof ReleaseSelectionSchema.parse>;

function selectionOf(
  value: SelectionInput,
  place: { lat: number | null; lon: number | null },
  redactionsDefaultOn: boolean,
): ReleaseSelection {
  return {
    from: value.from,
    to: value.to,
    kind: value.kind,
    stationId: value.station,
    foamClass: value.foamClass,
    basin: value.basin || undefined,
    radiusM: value.radiusM,
    center: place.lat !== null && place.lon !== null ? { lat: place.lat, lon: place.lon } : undefined,
    redactions: {
      personnel: redactionsDefaultOn || value.redactPersonnel === "on",
      notes: redactionsDefaultOn || value.redactNotes === "on",
      locations: redactionsDefaultOn || value.redactLocations === "on",
    },
  };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  await requireCapability(request, "records.manage");
  const found = await getRecordsRequest(requireRecordId(request, params.id, "There is no such request."));
  invariantResponse(found, "There is no such request.");
  const url = new URL(request.url);
  let preview = null;
  if (url.searchParams.get("preview") === "1") {
    const submission = parseWithZod(url.searchParams, { schema: ReleaseSelectionSchema });
    if (submission.status === "success") {
      const defaultOn = !url.searchParams.has("chosen");
      preview = {
        rows: await selectReleaseEvents(selectionOf(submission.value, found.place, defaultOn)),
        errors: null,
      };
    } else preview = { rows: [], errors: submission.error };
  }
  return { request: found, assignees: await listRecordsAssignees(), preview, search: url.search };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "records.manage");
  const id = requireRecordId(request, params.id, "There is no such request.");
  const formData = await readFormData(request, [RequestChangeSchema, BuildPackageSchema, SendPackageSchema]);
  if (formData.get("intent") === "build") {
    const built = parseWithZod(formData, { schema: BuildPackageSchema });
    if (built.status !== "success") return data({ intent: "build", result: built.reply() }, { status: 400 });
    const found = await getRecordsRequest(id);
    invariantResponse(found, "There is no such request.");
    try {
      await buildReleasePackage(id, user.id, selectionOf(built.value, found.place, false));
    } catch (error) {
      if (!(error instanceof PackageRefused)) throw error;
      return data({ intent: "build", result: built.reply({ formErrors: [error.message] }) }, { status: 400 });
    }
    return { intent: "build", result: built.reply() };
  }
  if (formData.get("intent") === "send") {
    const send = parseWithZod(formData, { schema: SendPackageSchema });
    if (send.status !== "success") return data({ intent: "send", result: send.reply() }, { status: 400 });
    try {
      await sendReleasePackage(id, send.value.packageId, user.id, send.value.status);
    } catch (error) {
      if (!(error instanceof PackageRefused)) throw error;
      return data({ intent: "send", result: send.reply({ formErrors: [error.message] }) }, { status: 400 });
    }
    deliverPendingMailSoon();
    return { intent: "send", result: send.reply() };
  }
  const submission = parseWithZod(formData, { schema: RequestChangeSchema });
  if (submission.status !== "success") {
    return data({ intent: String(formData.get("intent") ?? ""), result: submission.reply() }, { status: 400 });
  }
  const value = submission.value;
  try {
    await changeRecordsRequest(
      id,
      user.id,
      value.intent === "assign"
        ? { intent: "assign", assigneeId: value.assigneeId === "none" ? null : value.assigneeId }
        : value,
    );
  } catch (error) {
    if (!(error instanceof RequestChangeRefused)) throw error;
    return data({ intent: value.intent, result: submission.reply({ formErrors: [error.message] }) }, { status: 400 });
  }
  return { intent: value.intent, result: submission.reply({ resetForm: true }) };
}

function Errors({ intent }: { intent: string }) {
  const actionData = useActionData<typeof action>();
  if (actionData?.intent !== intent || !actionData.result.error) return null;
  const messages = Object.values(actionData.result.error).flat().filter(Boolean);
  return (
    <ul role="alert" className="text-sm text-red-800">
      {messages.map((message) => (
        <li key={String(message)}>{String(message)}</li>
      ))}
    </ul>
  );
}

export default function RecordsRequestPage({ loaderData }: Route.ComponentProps) {
  const { request, assignees } = loaderData;
  return (
    <section aria-labelledby="request-title" className="space-y-6">
      <h1 id="request-title" className="text-2xl font-bold">
        Request <span className="font-mono">{request.trackingCode}</span>
      </h1>
      <div className="grid gap-4 md:grid-cols-2">
        <div className="card">
          <h2 className="text-lg font-semibold">Requester</h2>
          <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            <dt>Name</dt>
            <dd>{request.requester.name}</dd>
            <dt>E-mail</dt>
            <dd>{request.requester.email}</dd>
            <dt>Phone</dt>
            <dd>{request.requester.phone ?? "—"}</dd>
            <dt>Organisation</dt>
            <dd>{request.requester.organisation ?? "—"}</dd>
          </dl>
        </div>
        <div className="card">
          <h2 className="text-lg font-semibold">Dates and status</h2>
          <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            <dt>Received</dt>
            <dd>{request.receivedAt.slice(0, 16).replace("T", " ")} UTC</dd>
            <dt>Day 0</dt>
            <dd>{request.countedFrom}</dd>
            <dt>Due</dt>
            <dd data-testid="due-on">{request.dueOn}</dd>
            <dt>Business days left</dt>
            <dd>{request.daysLeft ?? "—"}</dd>
            <dt>Status</dt>
            <dd data-testid="status">{request.statusLabel}</dd>
            <dt>Assignee</dt>
            <dd>{request.assignee?.name ?? "Nobody yet"}</dd>
          </dl>
        </div>
      </div>
      <div className="card">
        <h2 className="text-lg font-semibold">What was asked for</h2>
        <p className="mt-2 whitespace-pre-wrap text-sm">{request.description}</p>
        <p className="mt-2 text-sm text-slate-ft">
          Dates: {request.rangeFrom ?? "any"} to {request.rangeTo ?? "any"}. Place:{" "}
          {request.place.address ?? (request.place.lat !== null ? `${request.place.lat}, ${request.place.lon}` : "any")}
        </p>
      </div>
      <div className="grid gap-4 md:grid-cols-3">
        <Form method="post" className="card space-y-2">
          <h2 className="text-lg font-semibold">Status</h2>
          <input type="hidden" name="intent" value="status" />
          <select name="status" defaultValue={request.status} className="field-input" aria-label="New status">
            {RECORDS_REQUEST_STATUSES.map((status) => (
              <option key={status} value={status}>
                {RECORDS_REQUEST_STATUS_LABELS[status]}
              </option>
            ))}
          </select>
          <input name="note" className="field-input" placeholder="Note for the log (optional)" aria-label="Note" />
          <Errors intent="status" />
          <button type="submit" className="btn-secondary">
            Change status
          </button>
        </Form>
        <Form method="post" className="card space-y-2">
          <h2 className="text-lg font-semibold">Assignee</h2>
          <input type="hidden" name="intent" value="assign" />
          <select
            name="assigneeId"
            defaultValue={request.assignee?.id ?? "none"}
            className="field-input"
            aria-label="Assignee"
          >
            <option value="none">Nobody</option>
            {assignees.map((person) => (
              <option key={person.id} value={person.id}>
                {person.name}
              </option>
            ))}
          </select>
          <Errors intent="assign" />
          <button type="submit" className="btn-secondary">
            Assign
          </button>
        </Form>
        <Form method="post" className="card space-y-2">
          <h2 className="text-lg font-semibold">Extension</h2>
          <input type="hidden" name="intent" value="extend" />
          <label className="block text-sm">
            Days to add
            <input name="days" type="number" min={1} max={60} className="field-input" />
          </label>
          <label className="block text-sm">
            Reason (kept in the request’s log)
            <input name="reason" className="field-input" />
          </label>
          <Errors intent="extend" />
          <button type="submit" className="btn-secondary">
            Extend the due date
          </button>
        </Form>
      </div>
      <ReleaseSection />
      <RequestAttachments requestId={request.id} />
      <div className="card">
        <h2 className="text-lg font-semibold">Log</h2>
        <ol className="mt-2 space-y-1 text-sm" data-testid="request-log">
          {request.log.map((entry, index) => (
            <li key={index}>
              <span className="font-mono">{entry.at.slice(0, 16).replace("T", " ")}</span> ·{" "}
              {entry.actor ?? "public form"} · {entry.detail}
            </li>
          ))}
        </ol>
      </div>
    </section>
  );
}

function ReleaseSection() {
  const { request, preview, search } = useLoaderData<typeof loader>();
  const params = new URLSearchParams(search);
  const value = (name: string, fallback = "") => params.get(name) ?? fallback;
  const on = (name: string) => !params.has("chosen") || params.get(name) === "on";
  return (
    <div className="card space-y-4">
      <h2 className="text-lg font-semibold">Release package</h2>
      <p className="text-sm text-slate-ft">
        Only accepted usage reports are released. Check each redaction against the state’s public-records law and the
        agency’s counsel before sending.
      </p>
      <Form method="get" className="grid gap-3 md:grid-cols-4" aria-label="Select records">
        <input type="hidden" name="preview" value="1" />
        <input type="hidden" name="chosen" value="1" />
        <label className="text-sm">
          From
          <input
            name="from"
            type="date"
            defaultValue={value("from", request.rangeFrom ?? "")}
            className="field-input"
          />
        </label>
        <label className="text-sm">
          To
          <input name="to" type="date" defaultValue={value("to", request.rangeTo ?? "")} className="field-input" />
        </label>
        <label className="text-sm">
          Kind
          <select name="kind" defaultValue={value("kind")} className="field-input">
            <option value="">Any</option>
            {EVENT_KINDS.map((kind) => (
              <option key={kind} value={kind}>
                {EVENT_KIND_LABELS[kind]}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          Foam class
          <select name="foamClass" defaultValue={value("foamClass")} className="field-input">
            <option value="">Any</option>
            {FOAM_CLASSES.map((foamClass) => (
              <option key={foamClass} value={foamClass}>
                {FOAM_CLASS_LABELS[foamClass]}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          Station id
          <input name="station" inputMode="numeric" defaultValue={value("station")} className="field-input" />
        </label>
        <label className="text-sm">
          Drainage basin
          <input name="basin" defaultValue={value("basin")} className="field-input" />
        </label>
        <label className="text-sm">
          Radius around the request’s point (m)
          <input name="radiusM" inputMode="decimal" defaultValue={value("radiusM")} className="field-input" />
        </label>
        <fieldset className="text-sm md:col-span-4">
          <legend className="font-medium">Leave out</legend>
          <label className="mr-4">
            <input type="checkbox" name="redactPersonnel" defaultChecked={on("redactPersonnel")} /> personnel names and
            contacts
          </label>
          <label className="mr-4">
            <input type="checkbox" name="redactNotes" defaultChecked={on("redactNotes")} /> notes and review comments
          </label>
          <label>
            <input type="checkbox" name="redactLocations" defaultChecked={on("redactLocations")} /> exact locations
            (hundred block, 3 decimals)
          </label>
        </fieldset>
        <button type="submit" className="btn-secondary md:col-span-1">
          Preview
        </button>
      </Form>
      {preview ? (
        <div>
          <h3 className="font-semibold">Preview: exactly what goes out</h3>
          {preview.rows.length === 0 ? (
            <p className="text-sm">No accepted reports match.</p>
          ) : (
            <table className="mt-2 w-full text-sm" data-testid="release-preview">
              <thead>
                <tr>
                  <th className="text-left">Number</th>
                  <th className="text-left">Kind</th>
                  <th className="text-left">Started</th>
                  <th className="text-left">Location</th>
                  <th className="text-left">Coordinates</th>
                  <th className="text-left">Basin</th>
                  <th className="text-right">Solution (gal)</th>
                </tr>
              </thead>
              <tbody>
                {preview.rows.map((row) => (
                  <tr key={row.id} className="border-t">
                    <td className="event-number">{row.number}</td>
                    <td>{row.kind}</td>
                    <td>{row.startedAt}</td>
                    <td>{row.address}</td>
                    <td>
                      {row.latitude ?? "—"}, {row.longitude ?? "—"}
                    </td>
                    <td>{row.basin ?? "—"}</td>
                    <td className="text-right">{row.solutionGal}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
          <Form method="post" className="mt-3">
            <input type="hidden" name="intent" value="build" />
            {["from", "to", "kind", "foamClass", "station", "basin", "radiusM"].map((name) =>
              params.get(name) ? <input key={name} type="hidden" name={name} value={params.get(name)!} /> : null,
            )}
            {["redactPersonnel", "redactNotes", "redactLocations"].map((name) =>
              on(name) ? <input key={name} type="hidden" name={name} value="on" /> : null,
            )}
            <Errors intent="build" />
            <button type="submit" className="btn-primary" disabled={preview.rows.length === 0}>
              Build the package
            </button>
          </Form>
        </div>
      ) : null}
      {request.packages.map((pack) => (
        <div key={pack.id} className="rounded border p-3" data-testid="release-package">
          <h3 className="font-semibold">
            Package {pack.id} · built {pack.builtAt.slice(0, 16).replace("T", " ")} UTC
            {pack.sentAt ? ` · sent ${pack.sentAt.slice(0, 16).replace("T", " ")} UTC` : " · not sent"}
          </h3>
          <p className="font-mono text-xs">manifest SHA-256 {pack.manifestSha256}</p>
          <ul className="mt-2 text-sm">
            {pack.files.map((file) => (
              <li key={file.id}>
                <a
                  href={`/records/${request.id}/files/${file.id}`}
                  className="text-pond-700 underline underline-offset-4"
                >
                  {file.fileName}
                </a>{" "}
                · {file.byteSize.toLocaleString("en-US")} bytes ·{" "}
                <span className="font-mono text-xs">{file.sha256}</span>
              </li>
            ))}
          </ul>
          {pack.sentAt ? null : (
            <Form method="post" className="mt-2 flex flex-wrap items-end gap-2">
              <input type="hidden" name="intent" value="send" />
              <input type="hidden" name="packageId" value={pack.id} />
              <label className="text-sm">
                Close the request as
                <select name="status" defaultValue="fulfilled" className="field-input">
                  <option value="fulfilled">{RECORDS_REQUEST_STATUS_LABELS.fulfilled}</option>
                  <option value="partly_withheld">{RECORDS_REQUEST_STATUS_LABELS.partly_withheld}</option>
                </select>
              </label>
              <Errors intent="send" />
              <button type="submit" className="btn-primary">
                E-mail the package to the requester
              </button>
            </Form>
          )}
        </div>
      ))}
    </div>
  );
}
