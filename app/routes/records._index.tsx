import { Form, Link } from "react-router";
import type { Route } from "./+types/records._index";
import { requireCapability } from "~/lib/access.server";
import { RECORDS_REQUEST_STATUS_LABELS, RECORDS_REQUEST_STATUSES } from "~/lib/foam/vocabulary";
import { ignoredFiltersNote } from "~/lib/query-params";
import { queueQueryOf } from "~/lib/records/queue-query";
import { DUE_SOON_BUSINESS_DAYS } from "~/lib/records/urgency";
import { listRecordsAssignees, listRecordsRequests } from "~/models/records-request.server";

export const meta: Route.MetaFunction = () => [{ title: "Public-records requests · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "records.manage");
  const { query, problems } = queueQueryOf(new URL(request.url));
  const [items, assignees] = await Promise.all([listRecordsRequests(query), listRecordsAssignees()]);
  return { items, assignees, query, filterNote: ignoredFiltersNote(problems) };
}

const COLUMNS = [
  { key: "received", label: "Received" },
  { key: "due", label: "Due" },
  { key: null, label: "Business days left" },
  { key: "status", label: "Status" },
  { key: "assignee", label: "Assignee" },
] as const;

const URGENCY_CLASS = {
  overdue: "bg-red-50 font-semibold text-red-900",
  "due-soon": "bg-amber-50 font-semibold text-amber-900",
  "on-time": "",
  closed: "text-slate-ft",
};
const URGENCY_LABEL = { overdue: "Overdue", "due-soon": "Due soon", "on-time": "", closed: "" };

export default function RecordsQueue({ loaderData }: Route.ComponentProps) {
  const { items, assignees, query, filterNote } = loaderData;
  const link = (changes: Record<string, string | undefined>) => {
    const params = new URLSearchParams();
    const next = {
      status: query.status,
      assignee: query.assignee ? String(query.assignee) : undefined,
      sort: query.sort,
      dir: query.dir,
      ...changes,
    };
    for (const [key, value] of Object.entries(next)) if (value) params.set(key, value);
    return `?${params}`;
  };
  return (
    <section aria-labelledby="records-queue-title" className="space-y-4">
      <h1 id="records-queue-title" className="text-2xl font-bold">
        Public-records requests
      </h1>
      {filterNote ? (
        <p className="caution" role="note">
          {filterNote}
        </p>
      ) : null}
      <p className="text-sm text-slate-ft">
        Due dates follow the agency’s rule in the settings. Overdue requests and those due within{" "}
        {DUE_SOON_BUSINESS_DAYS} business days are marked. The state’s public-records law and the agency’s counsel
        decide what is due when; this table only counts.
      </p>
      <Form method="get" className="flex flex-wrap items-end gap-4">
        <label className="block">
          <span className="block text-sm font-medium">Status</span>
          <select name="status" defaultValue={query.status} className="field-input">
            <option value="open">Open (not closed)</option>
            <option value="all">All</option>
            {RECORDS_REQUEST_STATUSES.map((status) => (
              <option key={status} value={status}>
                {RECORDS_REQUEST_STATUS_LABELS[status]}
              </option>
            ))}
          </select>
        </label>
        <label className="block">
          <span className="block text-sm font-medium">Assignee</span>
          <select name="assignee" defaultValue={query.assignee ? String(query.assignee) : ""} className="field-input">
            <option value="">Anyone</option>
            <option value="none">Nobody yet</option>
            {assignees.map((person) => (
              <option key={person.id} value={person.id}>
                {person.name}
              </option>
            ))}
          </select>
        </label>
        <input type="hidden" name="sort" value={query.sort} />
        <input type="hidden" name="dir" value={query.dir} />
        <button type="submit" className="btn-secondary">
          Show
        </button>
      </Form>
      {items.length === 0 ? (
        <p className="card">No requests match.</p>
      ) : (
        <div className="table-scroll">
          <table className="w-full text-sm">
            <thead>
              <tr>
                <th className="px-2 py-2 text-left">Tracking code</th>
                {COLUMNS.map((column) => {
                  const active = column.key !== null && query.sort === column.key;
                  return (
                    <th
                      key={column.label}
                      className="px-2 py-2 text-left"
                      aria-sort={active ? (query.dir === "asc" ? "ascending" : "descending") : undefined}
                    >
                      {column.key ? (
                        <Link
                          to={link({ sort: column.key, dir: active && query.dir === "asc" ? "desc" : "asc" })}
                          className="underline underline-offset-4"
                        >
                          {column.label}
                        </Link>
                      ) : (
                        column.label
                      )}
                    </th>
                  );
                })}
              </tr>
            </thead>
            <tbody>
              {items.map((item) => (
                <tr key={item.id} className={`border-t ${URGENCY_CLASS[item.urgency]}`} data-urgency={item.urgency}>
                  <td className="px-2 py-2">
                    <Link to={`/records/${item.id}`} className="font-mono text-pond-700 underline underline-offset-4">
                      {item.trackingCode}
                    </Link>
                    <span className="block text-xs">{item.requesterName}</span>
                  </td>
                  <td className="px-2 py-2">{item.receivedAt.slice(0, 10)}</td>
                  <td className="px-2 py-2">{item.dueOn}</td>
                  <td className="px-2 py-2">
                    {item.daysLeft ?? "—"}{" "}
                    {URGENCY_LABEL[item.urgency] ? <span>({URGENCY_LABEL[item.urgency]})</span> : null}
                  </td>
                  <td className="px-2 py-2">{item.statusLabel}</td>
                  <td className="px-2 py-2">{item.assignee?.name ?? "Nobody yet"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}
