import { Form, Link, useSearchParams } from "react-router";
import type { Route } from "./+types/events._index";
import { requireCapability } from "~/lib/access.server";
import {
  countedReportsOfList,
  EVENT_KIND_LABELS,
  EVENT_KINDS,
  EVENT_STATUS_LABELS,
  EVENT_STATUSES,
  FOAM_CLASS_LABELS,
  FOAM_CLASSES,
  INCIDENT_TYPE_LABELS,
  INCIDENT_TYPES,
  incidentTypeLabel,
} from "~/lib/foam/vocabulary";
import { can } from "~/lib/access";
import { ignoredFiltersNote } from "~/lib/query-params";
import { listStationOptions } from "~/models/catalogue.server";
import { listEvents, parseEventFilters, type SortKey } from "~/models/event-read.server";
import { dataVersionsForRead } from "~/models/read-versions.server";

export const meta: Route.MetaFunction = () => [{ title: "Events · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "report.read");
  const { filters, errors } = parseEventFilters(new URL(request.url).searchParams);
  const [page, stations] = await Promise.all([
    listEvents(user, filters, await dataVersionsForRead(request)),
    listStationOptions(),
  ]);
  // Dates and the dispatch number show their problem at their fields; the rest in one note.
  const { from: _from, to: _to, dispatch: _dispatch, ...otherErrors } = errors;
  const filterNote = ignoredFiltersNote(otherErrors);
  return { ...page, filters, errors, filterNote, stations, canFile: can(user, "report.create") };
}

const gal = (value: number) => value.toLocaleString("en-US", { maximumFractionDigits: 1 });

const COLUMNS: Array<{ key: SortKey; label: string; numeric?: boolean }> = [
  { key: "number", label: "Number" },
  { key: "startedAt", label: "Started" },
  { key: "kind", label: "Kind" },
  { key: "incidentType", label: "Type" },
  { key: "dispatchNumber", label: "Dispatch no." },
  { key: "station", label: "Station" },
  { key: "status", label: "Status" },
  { key: "water", label: "Water (gal)", numeric: true },
  { key: "concentrate", label: "Concentrate (gal)", numeric: true },
  { key: "solution", label: "Solution (gal)", numeric: true },
];

export default function Events({ loaderData }: Route.ComponentProps) {
  const { items, count, totals, filters, errors, filterNote, stations, canFile } = loaderData;
  const [search] = useSearchParams();
  const withParams = (changes: Record<string, string | undefined>) => {
    const next = new URLSearchParams(search);
    for (const [key, value] of Object.entries(changes)) {
      if (value === undefined) next.delete(key);
      else next.set(key, value);
    }
    return `?${next.toString()}`;
  };
  const pages = Math.max(1, Math.ceil(count / filters.pageSize));
  const csv = new URLSearchParams(search);
  csv.delete("page");
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-2xl font-bold">Events</h1>
        <div className="flex gap-2">
          <a className="btn-secondary" href={`/events.csv?${csv.toString()}`} download>
            Download CSV
          </a>
          {canFile ? (
            <Link to="/events/new" className="btn-primary">
              New usage report
            </Link>
          ) : null}
        </div>
      </div>
      {filterNote ? (
        <p className="caution" role="note">
          {filterNote}
        </p>
      ) : null}
      <Form method="get" className="card grid gap-3 sm:grid-cols-3 lg:grid-cols-5" aria-label="Filter events">
        <Filter label="From" name="from" type="date" value={filters.from} error={errors.from} />
        <Filter label="To" name="to" type="date" value={filters.to} error={errors.to} />
        <Choice
          label="Kind"
          name="kind"
          value={filters.kind}
          options={EVENT_KINDS.map((kind) => [kind, EVENT_KIND_LABELS[kind]])}
        />
        <Choice
          label="Type"
          name="type"
          value={filters.incidentType}
          options={INCIDENT_TYPES.map((type) => [type, INCIDENT_TYPE_LABELS[type]])}
        />
        <Filter
          label="Dispatch number"
          name="dispatch"
          type="search"
          value={filters.dispatchNumber}
          error={errors.dispatch}
        />
        <Choice
          label="Status"
          name="status"
          value={filters.status}
          options={EVENT_STATUSES.map((status) => [status, EVENT_STATUS_LABELS[status]])}
        />
        <Choice
          label="Station"
          name="station"
          value={filters.stationId ? String(filters.stationId) : undefined}
          options={stations.map((station) => [String(station.id), `${station.code} ${station.name}`])}
        />
        <Choice
          label="Foam class"
          name="class"
          value={filters.foamClass}
          options={FOAM_CLASSES.map((foamClass) => [foamClass, FOAM_CLASS_LABELS[foamClass]])}
        />
        <div className="flex items-end gap-2">
          <input type="hidden" name="sort" value={filters.sort} />
          <input type="hidden" name="dir" value={filters.direction} />
          <button type="submit" className="btn-primary">
            Apply
          </button>
          <Link to="/events" className="btn-quiet">
            Clear
          </Link>
        </div>
      </Form>
      <div className="card overflow-x-auto">
        <table className="data-table" aria-describedby="events-count">
          <caption id="events-count" className="mb-2 text-left text-sm text-slate-ft">
            {count.toLocaleString("en-US")} event{count === 1 ? "" : "s"} match. Volumes in US gallons.
          </caption>
          <thead>
            <tr>
              {COLUMNS.map((column) => {
                const active = filters.sort === column.key;
                const direction = active && filters.direction === "asc" ? "desc" : "asc";
                return (
                  <th
                    key={column.key}
                    scope="col"
                    aria-sort={active ? (filters.direction === "asc" ? "ascending" : "descending") : "none"}
                    className={column.numeric ? "text-right" : ""}
                  >
                    <Link
                      to={withParams({ sort: column.key, dir: direction, page: undefined })}
                      className="underline-offset-4 hover:underline"
                    >
                      {column.label}
                      {active ? (filters.direction === "asc" ? " ▲" : " ▼") : ""}
                    </Link>
                  </th>
                );
              })}
            </tr>
          </thead>
          <tbody>
            {items.map((item) => (
              <tr key={item.id}>
                <td>
                  <Link
                    to={`/events/${item.id}`}
                    className="event-number font-semibold text-pond-700 underline underline-offset-4"
                  >
                    {item.number}
                  </Link>
                  {item.pfasContaining ? (
                    <span className="ml-1 rounded bg-danger-50 px-1 text-xs font-bold text-danger-700">PFAS</span>
                  ) : null}
                  {item.hasWarnings ? (
                    <span className="ml-1 text-xs text-caution-600" title="Has warnings">
                      ⚠
                    </span>
                  ) : null}
                </td>
                <td>{item.startedAt ? item.startedAt.replace("T", " ") : "—"}</td>
                <td>{EVENT_KIND_LABELS[item.kind]}</td>
                <td>{incidentTypeLabel(item.incidentType)}</td>
                <td className="whitespace-nowrap">{item.dispatchNumber ?? "—"}</td>
                <td>{item.station ?? "—"}</td>
                <td>{EVENT_STATUS_LABELS[item.status]}</td>
                <td className="text-right tabular-nums">{gal(item.water)}</td>
                <td className="text-right tabular-nums">{gal(item.concentrate)}</td>
                <td className="text-right tabular-nums">{gal(item.solution)}</td>
              </tr>
            ))}
            {items.length === 0 ? (
              <tr>
                <td colSpan={COLUMNS.length} className="py-6 text-center text-slate-ft">
                  No events match these filters.
                </td>
              </tr>
            ) : null}
          </tbody>
          <tfoot>
            <tr className="font-bold" data-testid="totals-row">
              <th scope="row" colSpan={COLUMNS.length - 3} className="px-2 py-2 text-left">
                Total of all {count.toLocaleString("en-US")} matching{" "}
                <span className="font-normal" data-testid="totals-counted">
                  ({countedReportsOfList(filters.status)})
                </span>
              </th>
              <td className="px-2 py-2 text-right tabular-nums">{gal(totals.water)}</td>
              <td className="px-2 py-2 text-right tabular-nums">{gal(totals.concentrate)}</td>
              <td className="px-2 py-2 text-right tabular-nums">{gal(totals.solution)}</td>
            </tr>
          </tfoot>
        </table>
      </div>
      <nav aria-label="Pages" className="flex items-center gap-3">
        {filters.page > 1 ? (
          <Link className="btn-secondary" to={withParams({ page: String(filters.page - 1) })}>
            Previous
          </Link>
        ) : null}
        <span className="text-sm">
          Page {filters.page} of {pages}
        </span>
        {filters.page < pages ? (
          <Link className="btn-secondary" to={withParams({ page: String(filters.page + 1) })}>
            Next
          </Link>
        ) : null}
      </nav>
    </div>
  );
}

function Filter({
  label,
  name,
  type,
  value,
  error,
}: {
  label: string;
  name: string;
  type: string;
  value?: string;
  error?: string;
}) {
  return (
    <div>
      <label htmlFor={`filter-${name}`} className="field-label">
        {label}
      </label>
      <input
        id={`filter-${name}`}
        name={name}
        type={type}
        defaultValue={value}
        className="field-input"
        aria-invalid={error ? true : undefined}
      />
      {error ? <p className="field-error">{error}</p> : null}
    </div>
  );
}

function Choice({
  label,
  name,
  value,
  options,
}: {
  label: string;
  name: string;
  value?: string;
  options: Array<[string, string]>;
}) {
  return (
    <div>
      <label htmlFor={`filter-${name}`} className="field-label">
        {label}
      </label>
      <select id={`filter-${name}`} name={name} defaultValue={value ?? ""} className="field-input">
        <option value="">Any</option>
        {options.map(([optionValue, text]) => (
          <option key={optionValue} value={optionValue}>
            {text}
          </option>
        ))}
      </select>
    </div>
  );
}
