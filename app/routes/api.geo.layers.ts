import type { Route } from "./+types/api.geo.layers";
import { requireCapability } from "~/lib/access.server";
import { isLayerKind } from "~/lib/geo/layers";
import { apiError } from "~/lib/http.server";
import { layerLabelPoints, layerText, waterwayBufferGeoJSON } from "~/models/geography.server";

const GEOJSON = { "Content-Type": "application/geo+json; charset=utf-8", "Cache-Control": "private, no-cache" };

/**
 * GET /api/geo/layers/:kind — the current GeoJSON of one layer, or `waterway_buffer` (computed);
 * `?as=labels` gives one named point inside each feature, for map labels.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  await requireCapability(request, "geography.read");
  return layerResponse(request, params.kind);
}

async function layerResponse(request: Request, kind: string) {
  if (kind === "waterway_buffer") {
    const { collection } = await waterwayBufferGeoJSON();
    return new Response(JSON.stringify(collection), { headers: GEOJSON });
  }
  if (!isLayerKind(kind)) apiError(404, `There is no layer called ${JSON.stringify(kind)}.`);
  if (new URL(request.url).searchParams.get("as") === "labels") {
    return new Response(JSON.stringify(await layerLabelPoints(kind)), { headers: GEOJSON });
  }
  const text = await layerText(kind);
  return new Response(text ?? JSON.stringify({ type: "FeatureCollection", features: [] }), { headers: GEOJSON });
}
