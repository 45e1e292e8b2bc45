import type { Route } from "./+types/records-requests.$trackingCode";
import { invariantResponse } from "~/lib/http.server";
import { publicStatusOf } from "~/models/records-request.server";

export const meta: Route.MetaFunction = () => [{ title: "Records request status · Foamtally" }];

// Public: the tracking code is the only key, and the page shows status and due date alone.
export async function loader({ request, params }: Route.LoaderArgs) {
  const code = (params.trackingCode ?? "").toUpperCase();
  const status = /^RR-[0-9A-Z]{5}-[0-9A-Z]{5}$/.test(code) ? await publicStatusOf(code) : null;
  invariantResponse(status, "There is no request with that tracking code.");
  return { ...status, received: new URL(request.url).searchParams.get("received") === "1" };
}

export default function RecordsRequestStatusPage({ loaderData }: Route.ComponentProps) {
  return (
    <section className="mx-auto max-w-xl" aria-labelledby="records-status-title">
      <div className="card">
        <h1 id="records-status-title" className="text-2xl font-bold">
          {loaderData.received ? "Your request was received" : "Records request"}
        </h1>
        {loaderData.received ? (
          <p className="mt-2 text-sm text-slate-ft">
            Keep the tracking code: it opens this page again. A copy was sent to your e-mail address.
          </p>
        ) : null}
        <dl className="mt-4 grid grid-cols-[auto_1fr] gap-x-6 gap-y-2">
          <dt className="font-medium">Tracking code</dt>
          <dd data-testid="tracking-code" className="font-mono">
            {loaderData.trackingCode}
          </dd>
          <dt className="font-medium">Status</dt>
          <dd data-testid="request-status">{loaderData.statusLabel}</dd>
          <dt className="font-medium">Answer due by</dt>
          <dd>{loaderData.dueOn}</dd>
        </dl>
      </div>
    </section>
  );
}
