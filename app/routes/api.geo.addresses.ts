import type { Route } from "./+types/api.geo.addresses";
import { requireCapability } from "~/lib/access.server";
import { apiError } from "~/lib/http.server";
import { findAddresses } from "~/models/geography.server";

/** GET /api/geo/addresses?q= — the district's own address points (no hosted geocoder). */
export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "geography.read");
  const query = new URL(request.url).searchParams.get("q")?.trim() ?? "";
  if (query.length > 120) apiError(400, "The search text is too long (120 characters at most).");
  const matches = query ? await findAddresses(query) : [];
  return Response.json({ query, matches });
}
