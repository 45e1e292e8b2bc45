import type { Route } from "./+types/api.map.events";
import { requireUser } from "~/lib/auth.server";
import { parseMapFilters } from "~/lib/geo/map-filters";
import { apiError } from "~/lib/http.server";
import { agencyTimeZone, mapEvents } from "~/models/usage-map.server";

/** GET /api/map/events.geojson?from=&to=&bbox=&class=&kind=&station= — filed events with their totals. */
export async function loader({ request }: Route.LoaderArgs) {
  await requireUser(request, ["chief", "environmental"]);
  const parsed = parseMapFilters(new URL(request.url).searchParams, await agencyTimeZone());
  if (!parsed.ok) apiError(400, parsed.message, { errors: { [parsed.field]: [parsed.message] } });
  return new Response(JSON.stringify(await mapEvents(parsed.filters)), {
    headers: { "Content-Type": "application/geo+json; charset=utf-8", "Cache-Control": "private, no-cache" },
  });
}
