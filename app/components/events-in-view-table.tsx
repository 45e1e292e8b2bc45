import { Link } from "react-router";
import { EVENT_KIND_LABELS, eventFoamClassesLabel } from "~/lib/foam/vocabulary";
import type { EventsInView } from "~/lib/geo/events-in-view";

const gal = (value: number) => value.toLocaleString("en-US", { minimumFractionDigits: 1, maximumFractionDigits: 1 });

/**
 * The events within the map's bounds and filters as a table, so that people who do not use the
 * canvas (keyboard, screen readers) can read and reach every event in view.
 */
export function EventsInViewTable({
  view,
  matching,
  timeZone,
  loading,
  onShow,
}: {
  view: EventsInView | null;
  /** How many events the filters select in all, in view or not; null while they load. */
  matching: number | null;
  timeZone: string;
  loading: boolean;
  onShow: (eventId: number) => void;
}) {
  const date = (instant: string | null) =>
    instant ? new Date(instant).toLocaleDateString("en-US", { timeZone, dateStyle: "medium" }) : "not given";
  const more = view ? view.total - view.rows.length : 0;
  return (
    <section className="card space-y-2" aria-labelledby="events-in-view-title">
      <h2 id="events-in-view-title" className="text-lg font-semibold">
        Events in view
      </h2>
      {view === null ? (
        <p className="text-sm text-slate-ft">{loading ? "Loading the events…" : "The events could not be loaded."}</p>
      ) : view.total === 0 ? (
        <p className="text-sm text-slate-ft" data-testid="events-in-view-count">
          {matching === 0
            ? "No events match these filters in this period. Change the dates or the filters above."
            : matching === 1
              ? "The 1 event that matches the filters is not in view. Zoom out or move the map."
              : `None of the ${matching} events that match the filters is in view. Zoom out or move the map.`}
        </p>
      ) : (
        <div className="overflow-x-auto">
          <table className="data-table" data-testid="events-in-view">
            <caption className="text-left text-sm text-slate-ft" data-testid="events-in-view-count">
              {view.total === 1 ? "1 event" : `${view.total} events`} within the map and filters, most concentrate first
              {more > 0 ? `; the first ${view.rows.length} are listed` : ""}.
            </caption>
            <thead>
              <tr>
                <th scope="col">Event</th>
                <th scope="col">Date</th>
                <th scope="col">Kind</th>
                <th scope="col">Foam class</th>
                <th scope="col">PFAS</th>
                <th scope="col" className="text-right">
                  Concentrate (US gal)
                </th>
                <th scope="col">Drainage basin</th>
                <th scope="col">
                  <span className="sr-only">On the map</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {view.rows.map(({ event }) => (
                <tr key={event.id}>
                  <th scope="row" className="border-b border-stone-200 font-normal whitespace-nowrap">
                    <Link to={`/events/${event.id}`} className="font-semibold text-pond-700 underline">
                      {event.number}
                    </Link>
                  </th>
                  <td className="whitespace-nowrap">{date(event.startedAt)}</td>
                  <td>{EVENT_KIND_LABELS[event.kind]}</td>
                  <td className="whitespace-nowrap">{eventFoamClassesLabel(event.foamClass)}</td>
                  <td className={event.pfasContaining ? "font-semibold text-danger-700" : undefined}>
                    {event.pfasContaining ? "PFAS-containing" : "No"}
                  </td>
                  <td className="text-right tabular-nums">{gal(event.concentrateGal)}</td>
                  <td>{event.drainageBasin ?? "Outside the basins"}</td>
                  <td>
                    <button
                      type="button"
                      className="btn-quiet whitespace-nowrap"
                      onClick={() => onShow(event.id)}
                      aria-label={`Show on map: ${event.number}`}
                    >
                      Show on map
                    </button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          {more > 0 ? (
            <p className="mt-1 text-sm text-slate-ft" data-testid="events-in-view-more">
              and {more} more. Zoom in or narrow the filters to list them.
            </p>
          ) : null}
        </div>
      )}
    </section>
  );
}
