import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, useActionData } from "react-router";
import type { Route } from "./+types/records.$id";
import { requireCapability } from "~/lib/access.server";
import { RECORDS_REQUEST_STATUS_LABELS, RECORDS_REQUEST_STATUSES } from "~/lib/foam/vocabulary";
import { readFormData } from "~/lib/form-data.server";
import { invariantResponse } from "~/lib/http.server";
import { RequestChangeSchema } from "~/lib/records/queue-query";
import {
  changeRecordsRequest,
  getRecordsRequest,
  listRecordsAssignees,
  RequestChangeRefused,
} from "~/models/records-request.server";

export const meta: Route.MetaFunction = ({ data: loaded }) => [
  { title: `${loaded?.request.trackingCode ?? "Request"} · Public-records requests · Foamtally` },
];

function idOf(params: { id: string }): number {
  const id = Number(params.id);
  invariantResponse(Number.isInteger(id) && id > 0, "There is no such request.");
  return id;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  await requireCapability(request, "records.manage");
  const found = await getRecordsRequest(idOf(params));
  invariantResponse(found, "There is no such request.");
  return { request: found, assignees: await listRecordsAssignees() };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "records.manage");
  const id = idOf(params);
  const formData = await readFormData(request, RequestChangeSchema);
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
