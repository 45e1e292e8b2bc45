import type { Route } from "./+types/api.geo.check";
import { requireCapability } from "~/lib/access.server";
import { isValidLatLon } from "~/lib/geo/checks";
import { apiError } from "~/lib/http.server";
import { checkPoint } from "~/models/geography.server";

/** GET /api/geo/check?lat=&lon= — where a point sits against the basins, waterways, inlets and boundary. */
export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "geography.read");
  const url = new URL(request.url);
  const lat = url.searchParams.get("lat")?.trim() ?? "";
  const lon = url.searchParams.get("lon")?.trim() ?? "";
  const latitude = Number(lat);
  const longitude = Number(lon);
  const errors: Record<string, string[]> = {};
  if (!lat || !Number.isFinite(latitude) || latitude < -90 || latitude > 90)
    errors.lat = ["lat must be a latitude in degrees, −90 to 90."];
  if (!lon || !Number.isFinite(longitude) || longitude < -180 || longitude > 180)
    errors.lon = ["lon must be a longitude in degrees, −180 to 180."];
  if (Object.keys(errors).length || !isValidLatLon(latitude, longitude)) {
    apiError(400, "Give the point as lat and lon in decimal degrees (WGS 84).", { errors });
  }
  const checks = await checkPoint(latitude, longitude);
  return Response.json({ latitude, longitude, ...checks });
}
