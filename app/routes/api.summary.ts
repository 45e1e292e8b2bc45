import type { Route } from "./+types/api.summary";
import { requireCapability } from "~/lib/access.server";
import { parseMapFilters } from "~/lib/geo/map-filters";
import { apiError } from "~/lib/http.server";
import { mapReadState, usageSummaryKept } from "~/models/usage-map.server";

/** GET /api/summary?from=&to=&bbox= — totals by foam class, product, runoff disposition, drainage basin. */
export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "usage.map");
  const { versions, timeZone } = await mapReadState(request);
  const parsed = parseMapFilters(new URL(request.url).searchParams, timeZone);
  if (!parsed.ok) apiError(400, parsed.message, { errors: { [parsed.field]: [parsed.message] } });
  const summary = await usageSummaryKept(parsed.filters, timeZone, versions);
  return Response.json(summary, {
    headers: { "Cache-Control": "private, no-store" },
  });
}
