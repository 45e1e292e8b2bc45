import type { Route } from "./+types/api.map.events";
import { requireCapability } from "~/lib/access.server";
import { parseMapFilters } from "~/lib/geo/map-filters";
import { apiError } from "~/lib/http.server";
import { readAgencySettings } from "~/models/agency-settings.server";
import { mapEvents } from "~/models/usage-map.server";

/** GET /api/map/events.geojson?from=&to=&bbox=&class=&kind=&station= — filed events with their totals. */
export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "usage.map");
  const parsed = parseMapFilters(new URL(request.url).searchParams, (await readAgencySettings()).timeZone);
  if (!parsed.ok) apiError(400, parsed.message, { errors: { [parsed.field]: [parsed.message] } });
  const collection = await mapEvents(parsed.filters);
  return new Response(JSON.stringify(collection), {
    headers: { "Content-Type": "application/geo+json; charset=utf-8", "Cache-Control": "private, no-store" },
  });
}
