import { Link } from "react-router";
import type { Route } from "./+types/review";
import { requireCapability } from "~/lib/access.server";
import { EVENT_KIND_LABELS, REVIEW_FLAG_LABELS } from "~/lib/foam/vocabulary";
import { waitingText } from "~/lib/waiting-time";
import { reviewQueue } from "~/models/review-queue.server";

export const meta: Route.MetaFunction = () => [{ title: "To review · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "report.review");
  return { items: await reviewQueue() };
}

const gal = (value: number) => value.toLocaleString("en-US", { maximumFractionDigits: 1 });

export default function ReviewQueue({ loaderData }: Route.ComponentProps) {
  const { items } = loaderData;
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">To review</h1>
      <p className="text-sm text-slate-ft">
        Filed reports awaiting review, the longest waiting first. Flags say what to look at before accepting.
      </p>
      {items.length === 0 ? (
        <p className="card">No filed report is waiting for review.</p>
      ) : (
        <div className="card overflow-x-auto">
          <table className="data-table" data-testid="review-queue">
            <thead>
              <tr>
                <th scope="col">Report</th>
                <th scope="col">Waiting</th>
                <th scope="col">Filed</th>
                <th scope="col">Kind</th>
                <th scope="col">Station</th>
                <th scope="col">Filed by</th>
                <th scope="col">Computed concentrate (gal)</th>
                <th scope="col">Flags</th>
              </tr>
            </thead>
            <tbody>
              {items.map((item) => (
                <tr key={item.id}>
                  <td className="whitespace-nowrap">
                    <Link to={`/events/${item.id}`} className="font-semibold text-pond-700 underline">
                      {item.number}
                    </Link>
                  </td>
                  <td className="whitespace-nowrap" data-testid="waiting">
                    {waitingText(item.minutesWaiting)}
                  </td>
                  <td className="whitespace-nowrap">{item.filedAt || "—"}</td>
                  <td>{EVENT_KIND_LABELS[item.kind]}</td>
                  <td>{item.station ?? "—"}</td>
                  <td>{item.authorName ?? "—"}</td>
                  <td className="text-right tabular-nums">{gal(item.concentrateGal)}</td>
                  <td>
                    {item.flags.length === 0 ? (
                      <span className="text-slate-ft">none</span>
                    ) : (
                      <ul className="flex flex-wrap gap-1" aria-label={`Flags of ${item.number}`}>
                        {item.flags.map((flag) => (
                          <li
                            key={flag}
                            className={`rounded px-2 py-0.5 text-xs font-semibold ${
                              flag === "pfas" || flag === "to-water"
                                ? "bg-danger-50 text-danger-700"
                                : "bg-stone-200 text-slate-ft"
                            }`}
                          >
                            {REVIEW_FLAG_LABELS[flag]}
                          </li>
                        ))}
                      </ul>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
