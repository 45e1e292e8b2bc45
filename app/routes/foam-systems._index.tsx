import { Link } from "react-router";
import type { Route } from "./+types/foam-systems._index";
import { requireCapability } from "~/lib/access.server";
import { FLEET_STATUS_LABELS, FOAM_SYSTEM_TYPE_LABELS, PERCENT_OF_EXPORT_LABELS } from "~/lib/foam/vocabulary";
import { localDateTime } from "~/lib/time-zone";
import { readAgencySettings } from "~/models/agency-settings.server";
import { listFleet } from "~/models/foam-system.server";

export const meta: Route.MetaFunction = () => [{ title: "Foam systems · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "systems.read");
  const [items, settings] = await Promise.all([listFleet(), readAgencySettings()]);
  const when = (instant: Date | null) => (instant ? localDateTime(instant, settings.timeZone).slice(0, 10) : "never");
  return {
    intervals: { months: settings.accuracyTestIntervalMonths, days: settings.flushIntervalDays },
    items: items.map((item) => ({
      id: item.id,
      apparatus: item.apparatus,
      station: item.stationCode,
      name: item.name,
      type: FOAM_SYSTEM_TYPE_LABELS[item.type],
      percentOf: PERCENT_OF_EXPORT_LABELS[item.percentOf],
      lastFlush: when(item.lastFlushAt),
      lastTest: when(item.lastTestAt),
      lastTestPass: item.lastTestPass,
      nextTestDue: item.nextTestDue,
      nextFlushDue: item.nextFlushDue,
      status: item.status,
      statusReason: item.statusReason,
    })),
  };
}

const STATUS_CLASS = {
  out_of_tolerance: "font-semibold text-red-800",
  overdue: "font-semibold text-amber-800",
  due_soon: "text-amber-800",
  current: "text-slate-ft",
} as const;

export default function FoamSystems({ loaderData }: Route.ComponentProps) {
  const { items, intervals } = loaderData;
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-bold">Foam systems</h1>
      <p className="max-w-3xl text-sm text-slate-ft">
        Every figure Foamtally computes rests on the percentage a proportioner meters. Systems out of tolerance and
        overdue come first. Accuracy tests are due every {intervals.months} months and flushes every {intervals.days}{" "}
        days (agency settings; the defaults are common practice, no source).
      </p>
      <section className="card overflow-x-auto" aria-labelledby="fleet-title">
        <h2 id="fleet-title" className="text-lg font-semibold">
          The fleet
        </h2>
        {items.length === 0 ? (
          <p className="mt-3 text-sm">No foam systems yet. Add one from an apparatus&rsquo;s page.</p>
        ) : (
          <table className="data-table mt-3">
            <thead>
              <tr>
                <th scope="col">Apparatus / system</th>
                <th scope="col">Type</th>
                <th scope="col">Percent of</th>
                <th scope="col">Last flush</th>
                <th scope="col">Last test</th>
                <th scope="col">Next test due</th>
                <th scope="col">Next flush due</th>
                <th scope="col">Status</th>
              </tr>
            </thead>
            <tbody>
              {items.map((item) => (
                <tr key={item.id} data-testid="fleet-row">
                  <td>
                    <Link to={`/foam-systems/${item.id}`} className="font-medium text-pond-700 underline">
                      {item.apparatus} · {item.name}
                    </Link>
                    {item.station ? <span className="block text-xs text-slate-ft">Station {item.station}</span> : null}
                  </td>
                  <td>{item.type}</td>
                  <td>{item.percentOf}</td>
                  <td>{item.lastFlush}</td>
                  <td>
                    {item.lastTest}
                    {item.lastTestPass == null ? "" : item.lastTestPass ? " · passed" : " · failed"}
                  </td>
                  <td>{item.nextTestDue}</td>
                  <td>{item.nextFlushDue}</td>
                  <td className={STATUS_CLASS[item.status]}>
                    {FLEET_STATUS_LABELS[item.status]}
                    {item.statusReason ? <span className="block text-xs">{item.statusReason}</span> : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
    </div>
  );
}
