import type { Route } from "./+types/api.geo.check";
import { requireCapability } from "~/lib/access.server";
import { isValidLatLon } from "~/lib/geo/checks";
import { apiError } from "~/lib/http.server";
import { queryReader } from "~/lib/query-params";
import { checkPoint } from "~/models/geography.server";

const LATITUDE = "lat must be a latitude in degrees, −90 to 90.";
const LONGITUDE = "lon must be a longitude in degrees, −180 to 180.";

/** GET /api/geo/check?lat=&lon= — where a point sits against the basins, waterways, inlets and boundary. */
export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "geography.read");
  const query = queryReader(new URL(request.url).searchParams);
  const latitude = query.decimal("lat", { min: -90, max: 90 }, LATITUDE);
  const longitude = query.decimal("lon", { min: -180, max: 180 }, LONGITUDE);
  // Both are needed: a missing one is a problem here, not an unset filter.
  if (latitude === undefined) query.problems.lat ??= LATITUDE;
  if (longitude === undefined) query.problems.lon ??= LONGITUDE;
  if (latitude === undefined || longitude === undefined || !isValidLatLon(latitude, longitude)) {
    const errors = Object.fromEntries(Object.entries(query.problems).map(([name, problem]) => [name, [problem]]));
    apiError(400, "Give the point as lat and lon in decimal degrees (WGS 84).", { errors });
  }
  const checks = await checkPoint(latitude, longitude);
  return Response.json({ latitude, longitude, ...checks });
}
