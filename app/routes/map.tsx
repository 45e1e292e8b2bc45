import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { Form, useFetcher } from "react-router";
import type { Route } from "./+types/map";
import { EventsInViewTable } from "~/components/events-in-view-table";
import { ConcentrateByMonthChart, ConcentrateByStationChart } from "~/components/usage-charts";
import {
  FOAM_CLASS_COLOURS,
  OVERLAYS,
  PFAS_RING,
  UsageMap,
  type OverlayId,
  type UsageMapControl,
} from "~/components/usage-map";
import { requireCapability } from "~/lib/access.server";
import { COUNTED_REPORTS } from "~/lib/foam/vocabulary";
import { eventsInView, type MappedEventFeature } from "~/lib/geo/events-in-view";
import {
  BOTH_CLASSES_LABEL,
  DISPOSITION_LABELS,
  EVENT_KIND_LABELS,
  EVENT_KINDS,
  FOAM_CLASS_LABELS,
  FOAM_CLASSES,
  WATER_ONLY_LABEL,
} from "~/lib/foam/vocabulary";
import { mapQuery, readMapFilters, type BoundingBox } from "~/lib/geo/map-filters";
import { httpError } from "~/lib/http.server";
import { ignoredFiltersNote } from "~/lib/query-params";
import { localDateTime } from "~/lib/time-zone";
import { listStations, mapReadState, usageSummaryKept, type UsageSummary } from "~/models/usage-map.server";

export const meta: Route.MetaFunction = () => [{ title: "Usage map · Foamtally" }];

function defaultRange(timeZone: string) {
  const today = localDateTime(new Date(), timeZone).slice(0, 10);
  const start = new Date(`${today}T00:00:00Z`);
  start.setUTCFullYear(start.getUTCFullYear() - 1);
  start.setUTCDate(start.getUTCDate() + 1);
  return { from: start.toISOString().slice(0, 10), to: today };
}

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "usage.map");
  const { versions, timeZone } = await mapReadState(request);
  const params = new URL(request.url).searchParams;
  const range = defaultRange(timeZone);
  if (!params.get("from")) params.set("from", range.from);
  if (!params.get("to")) params.set("to", range.to);
  params.delete("bbox");
  // A filter the page cannot use is left out (a period, for the last twelve months) and named.
  const { filters, problems } = readMapFilters(params, timeZone, range);
  if (!filters) httpError(400, "The period cannot be read.");
  const [stations, summary] = await Promise.all([listStations(), usageSummaryKept(filters, timeZone, versions)]);
  return {
    filters: {
      from: filters.from,
      to: filters.to,
      foamClass: filters.foamClass ?? "",
      kind: filters.kind ?? "",
      stationId: filters.stationId ? String(filters.stationId) : "",
    },
    stations,
    summary,
    timeZone,
    filterNote: ignoredFiltersNote(problems),
  };
}

/** Rows in the list of events in view; the rest are counted. */
const EVENTS_LISTED = 50;

const gal = (value: number) => `${value.toLocaleString("en-US", { maximumFractionDigits: 1 })} gal`;

export default function UsageMapPage({ loaderData }: Route.ComponentProps) {
  const { filters, stations } = loaderData;
  const summaryFetcher = useFetcher<UsageSummary>();
  const [overlays, setOverlays] = useState<Record<OverlayId, boolean>>({
    basins: true,
    waterways: false,
    buffer: false,
    inlets: false,
  });
  const eventsQuery = useMemo(() => mapQuery(filters), [filters]);
  const { load } = summaryFetcher;
  const [bounds, setBounds] = useState<BoundingBox | null>(null);
  const [mappedEvents, setMappedEvents] = useState<MappedEventFeature[] | null | undefined>(undefined);
  const mapControl = useRef<UsageMapControl | null>(null);
  const onViewChange = useCallback((bbox: BoundingBox) => setBounds(bbox), []);
  // The in-view totals follow the view and the filters alike: a new filter asks again for the same
  // view, and figures fetched for an earlier filter or view are never shown as the current ones.
  const summaryUrl = bounds ? `/api/summary?${mapQuery({ ...filters, bbox: bounds })}` : null;
  const requestedUrl = useRef<string | null>(null);
  const [shownUrl, setShownUrl] = useState<string | null>(null);
  useEffect(() => {
    if (!summaryUrl) return;
    requestedUrl.current = summaryUrl;
    void load(summaryUrl);
  }, [summaryUrl, load]);
  useEffect(() => {
    if (summaryFetcher.state === "idle" && summaryFetcher.data) setShownUrl(requestedUrl.current);
  }, [summaryFetcher.state, summaryFetcher.data]);
  // The events drawn for an earlier filter are not listed while the new ones load.
  useEffect(() => setMappedEvents(undefined), [eventsQuery]);
  const listed = useMemo(
    () => (mappedEvents && bounds ? eventsInView(mappedEvents, bounds, EVENTS_LISTED) : null),
    [mappedEvents, bounds],
  );
  const inView = Boolean(summaryFetcher.data?.bbox) && shownUrl !== null && shownUrl === summaryUrl;
  const summary = inView && summaryFetcher.data ? summaryFetcher.data : loaderData.summary;

  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Usage map</h1>
      {loaderData.filterNote ? (
        <p className="caution" role="note">
          {loaderData.filterNote}
        </p>
      ) : null}
      <p className="caution">
        Figures are estimates computed from what officers entered. Circles are sized by concentrate used; a red ring
        marks PFAS-containing foam. A release at or above a reportable quantity must be reported immediately (CERCLA
        §103, EPCRA §304; states add their own, e.g. Colorado within 24 hours, C.R.S. 25-5-1303.5); this map is not a
        notification. Local codes, permits and licensed practice govern reporting and clean-up.
      </p>
      <Form method="get" className="card flex flex-wrap items-end gap-3" aria-label="Map filters">
        <label>
          <span className="field-label">From</span>
          <input type="date" name="from" defaultValue={filters.from} className="field-input" required />
        </label>
        <label>
          <span className="field-label">To</span>
          <input type="date" name="to" defaultValue={filters.to} className="field-input" required />
        </label>
        <label>
          <span className="field-label">Kind</span>
          <select name="kind" defaultValue={filters.kind} className="field-input">
            <option value="">All kinds</option>
            {EVENT_KINDS.map((kind) => (
              <option key={kind} value={kind}>
                {EVENT_KIND_LABELS[kind]}
              </option>
            ))}
          </select>
        </label>
        <label>
          <span className="field-label">Foam class</span>
          <select name="class" defaultValue={filters.foamClass} className="field-input">
            <option value="">A and B</option>
            {FOAM_CLASSES.map((foamClass) => (
              <option key={foamClass} value={foamClass}>
                {FOAM_CLASS_LABELS[foamClass]}
              </option>
            ))}
          </select>
        </label>
        <label>
          <span className="field-label">Station</span>
          <select name="station" defaultValue={filters.stationId} className="field-input">
            <option value="">All stations</option>
            {stations.map((station) => (
              <option key={station.id} value={station.id}>
                {station.code} {station.name}
              </option>
            ))}
          </select>
        </label>
        <button type="submit" className="btn-primary">
          Show
        </button>
      </Form>

      <div className="grid grid-cols-[minmax(0,1fr)] gap-4 lg:grid-cols-[minmax(0,1fr)_26rem]">
        <div className="min-w-0 space-y-2">
          <fieldset className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
            <legend className="sr-only">Layers</legend>
            {OVERLAYS.map((overlay) => (
              <label key={overlay.id} className="flex min-h-11 items-center gap-2">
                <input
                  type="checkbox"
                  className="h-5 w-5"
                  checked={overlays[overlay.id]}
                  onChange={(event) => setOverlays((current) => ({ ...current, [overlay.id]: event.target.checked }))}
                />
                {overlay.label}
              </label>
            ))}
          </fieldset>
          <UsageMap
            eventsQuery={eventsQuery}
            timeZone={loaderData.timeZone}
            overlays={overlays}
            onViewChange={onViewChange}
            onEventsChange={setMappedEvents}
            control={mapControl}
          />
          <MapKey />
          <EventsInViewTable
            view={listed}
            matching={mappedEvents?.length ?? null}
            timeZone={loaderData.timeZone}
            loading={mappedEvents === undefined}
            onShow={(eventId) => {
              if (mapControl.current?.showEvent(eventId)) {
                document.querySelector("[data-testid=usage-map]")?.scrollIntoView({ block: "nearest" });
              }
            }}
          />
        </div>

        <aside className="card space-y-4" aria-labelledby="in-view-title">
          <div aria-live="polite">
            <h2 id="in-view-title" className="text-lg font-semibold">
              {inView ? "In view" : "Whole district"}
              {summaryFetcher.state === "loading" || (summaryUrl !== null && !inView) ? (
                <span className="ml-2 text-sm text-slate-ft">updating…</span>
              ) : null}
            </h2>
            <p className="text-sm text-slate-ft">
              {summary.from} to {summary.to}; reports counted: {COUNTED_REPORTS.submitted} (drafts left out). US
              gallons.
            </p>
            <dl className="mt-2 grid grid-cols-2 gap-x-4 gap-y-1 text-sm">
              <dt>Events</dt>
              <dd data-testid="in-view-events" className="font-semibold">
                {summary.totals.events}
              </dd>
              <dt>Concentrate</dt>
              <dd data-testid="in-view-concentrate" className="font-semibold">
                {gal(summary.totals.concentrateGal)}
              </dd>
              <dt>Foam solution</dt>
              <dd>{gal(summary.totals.solutionGal)}</dd>
              <dt>Water</dt>
              <dd>{gal(summary.totals.waterGal)}</dd>
              <dt className="text-danger-700">PFAS-containing events</dt>
              <dd className="text-danger-700">
                {summary.totals.pfasEvents} ({gal(summary.totals.pfasConcentrateGal)} concentrate)
              </dd>
            </dl>
          </div>
          <SummaryTable
            title="By foam class"
            head={["Class", "Concentrate", "Events"]}
            rows={summary.byFoamClass.map((row) => [
              FOAM_CLASS_LABELS[row.foamClass],
              gal(row.concentrateGal),
              row.events,
            ])}
          />
          <SummaryTable
            title="By product"
            head={["Product", "Concentrate", "Events"]}
            rows={summary.byProduct.map((row) => [
              `${row.name}${row.pfasContaining ? " (PFAS)" : ""}`,
              gal(row.concentrateGal),
              row.events,
            ])}
          />
          <SummaryTable
            title="Where the runoff went"
            head={["Disposition", "Solution", "Events"]}
            rows={summary.byDisposition.map((row) => [
              DISPOSITION_LABELS[row.disposition],
              gal(row.solutionGal),
              row.events,
            ])}
          />
          <SummaryTable
            title="By drainage basin"
            head={["Basin", "Concentrate", "Events"]}
            rows={summary.byDrainageBasin.map((row) => [
              row.drainageBasin ?? "Outside the basins",
              gal(row.concentrateGal),
              row.events,
            ])}
          />
          <ConcentrateByMonthChart rows={summary.byMonth} />
          <ConcentrateByStationChart rows={summary.byStation} />
        </aside>
      </div>
    </div>
  );
}

function SummaryTable({ title, head, rows }: { title: string; head: string[]; rows: (string | number)[][] }) {
  return (
    <section>
      <h3 className="text-sm font-semibold">{title}</h3>
      {rows.length === 0 ? (
        <p className="text-sm text-slate-ft">Nothing in view.</p>
      ) : (
        <table className="data-table">
          <thead>
            <tr>
              {head.map((label) => (
                <th key={label} scope="col">
                  {label}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((row) => (
              <tr key={String(row[0])}>
                {row.map((cell, index) => (
                  <td key={index}>{cell}</td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}

function MapKey() {
  const swatch = (colour: string, label: string) => (
    <span className="flex items-center gap-1">
      <span aria-hidden="true" className="inline-block h-3 w-3 rounded-full" style={{ background: colour }} />
      {label}
    </span>
  );
  return (
    <div className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-slate-ft" aria-label="Map key">
      {swatch(FOAM_CLASS_COLOURS.A, FOAM_CLASS_LABELS.A)}
      {swatch(FOAM_CLASS_COLOURS.B, FOAM_CLASS_LABELS.B)}
      {swatch(FOAM_CLASS_COLOURS["A+B"], BOTH_CLASSES_LABEL)}
      {swatch(FOAM_CLASS_COLOURS.none, WATER_ONLY_LABEL)}
      <span className="flex items-center gap-1">
        <span
          aria-hidden="true"
          className="inline-block h-3 w-3 rounded-full border-2"
          style={{ borderColor: PFAS_RING }}
        />
        PFAS-containing
      </span>
      <span>Dark circles: groups of events (click to zoom in)</span>
    </div>
  );
}
