import { Link } from "react-router";
import type { Route } from "./+types/home";
import { RoleHome } from "~/components/role-home";
import { can } from "~/lib/access";
import { requireUser } from "~/lib/auth.server";
import { awaitingReviewCount, draftsOf, returnedReportsFor } from "~/models/event-read.server";

export const meta: Route.MetaFunction = () => [{ title: "Home · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const author = can(user, "report.create");
  const [returned, drafts, awaiting] = await Promise.all([
    author ? returnedReportsFor(user) : [],
    author ? draftsOf(user) : [],
    can(user, "report.review") ? awaitingReviewCount() : null,
  ]);
  return { name: user.name, roles: user.roles, returned, drafts, awaiting };
}

export default function Home({ loaderData }: Route.ComponentProps) {
  const { returned, drafts, awaiting } = loaderData;
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-bold">Welcome, {loaderData.name}</h1>
      {returned.length ? (
        <section className="card border-l-4 border-l-ember-600" aria-labelledby="returned-title">
          <h2 id="returned-title" className="text-lg font-semibold">
            Returned to you for changes
          </h2>
          <ul className="mt-2 space-y-2">
            {returned.map((report) => (
              <li key={report.id}>
                <Link
                  to={`/events/${report.id}/edit`}
                  className="event-number font-semibold text-pond-700 underline underline-offset-4"
                >
                  {report.number}
                </Link>
                {report.comment ? <span className="block text-sm">“{report.comment}”</span> : null}
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      {drafts.length ? (
        <section className="card" aria-labelledby="drafts-title">
          <h2 id="drafts-title" className="text-lg font-semibold">
            Your drafts
          </h2>
          <ul className="mt-2 space-y-1">
            {drafts.map((report) => (
              <li key={report.id}>
                <Link
                  to={`/events/${report.id}/edit`}
                  className="event-number text-pond-700 underline underline-offset-4"
                >
                  {report.number}
                </Link>
                <span className="ml-2 text-sm text-slate-ft">
                  saved {report.updatedAt.slice(0, 16).replace("T", " ")} UTC
                </span>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      {awaiting != null ? (
        <p className="card">
          <Link to="/review" className="font-semibold text-pond-700 underline underline-offset-4">
            {awaiting} filed report{awaiting === 1 ? "" : "s"} waiting for review
          </Link>
        </p>
      ) : null}
      <RoleHome roles={loaderData.roles} />
    </div>
  );
}
