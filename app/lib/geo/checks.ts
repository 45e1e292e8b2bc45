import {
  booleanPointInPolygon,
  buffer,
  distance,
  flattenEach,
  nearestPointOnLine,
  pointOnFeature,
  polygonToLine,
} from "@turf/turf";
import type { Feature, FeatureCollection, LineString, MultiPolygon, Polygon, Position } from "geojson";
import { featureName, type LayerKind } from "./layers";

export { isValidLatLon } from "./coordinates";

/**
 * 300 ft (91.44 m, exact by the definition of the foot): the distance from waterways within which
 * the USDA Forest Service aerial-application guide avoids dropping retardant or foam. Ground use has
 * no fixed distance (interagency wildland fire operations guide); the agency's own setting and local
 * rules govern.
 */
export const DEFAULT_WATERWAY_BUFFER_M = 91.44;

export type GeographyLayers = {
  drainageBasins: FeatureCollection | null;
  waterways: FeatureCollection | null;
  stormInlets: FeatureCollection | null;
  jurisdiction: FeatureCollection | null;
};

export type GeographyChecks = {
  drainageBasin: string | null;
  nearestWaterway: string | null;
  nearestWaterwayM: number | null;
  nearestInlet: string | null;
  nearestInletM: number | null;
  withinWaterwayBuffer: boolean | null;
  outsideJurisdiction: boolean | null;
};

/** The checks of one point as `/api/geo/check` answers them, with the buffer used and the layers not loaded. */
export type LocationCheck = GeographyChecks & { waterwayBufferM: number; layersMissing: LayerKind[] };

export type LatLon = { latitude: number; longitude: number };

type Area = Feature<Polygon | MultiPolygon>;

function areas(collection: FeatureCollection | null): Area[] {
  if (!collection) return [];
  return collection.features.filter(
    (feature): feature is Area => feature.geometry?.type === "Polygon" || feature.geometry?.type === "MultiPolygon",
  );
}

/**
 * The first basin (in the layer's order) whose polygon contains the point; a point exactly on a
 * divide counts as inside, so it lands in the first of the basins that share that edge.
 */
export function drainageBasinAt(point: Position, basins: FeatureCollection | null): string | null {
  const found = areas(basins).findIndex((basin) => booleanPointInPolygon(point, basin));
  return found === -1 ? null : featureName(areas(basins)[found], `Basin ${found + 1}`);
}

/** Metres from the point to the nearest line of a feature; 0 inside a polygon (a pond or lake). */
export function metresToFeature(point: Position, feature: Feature): number {
  let best = Infinity;
  flattenEach(feature, (part) => {
    const geometry = part.geometry;
    if (geometry.type === "Point") {
      best = Math.min(best, distance(point, geometry.coordinates, { units: "meters" }));
    } else if (geometry.type === "LineString") {
      best = Math.min(best, metresToLine(point, geometry));
    } else if (geometry.type === "Polygon") {
      if (booleanPointInPolygon(point, geometry)) {
        best = 0;
        return;
      }
      const outline = polygonToLine(geometry);
      flattenEach(outline, (ring) => {
        if (ring.geometry.type === "LineString") best = Math.min(best, metresToLine(point, ring.geometry));
      });
    }
  });
  return best;
}

function metresToLine(point: Position, line: LineString): number {
  return nearestPointOnLine(line, point, { units: "meters" }).properties.pointDistance;
}

// Metres per degree of latitude on turf's sphere (mean radius 6,371,008.8 m).
const METRES_PER_DEGREE = (6_371_008.8 * Math.PI) / 180;

/**
 * A quick estimate of the metres from the point to a feature on a local flat projection (within
 * about 0.5 % over a district), used only to pick which features to measure properly.
 */
export function roughMetresToFeature(point: Position, feature: Feature): number {
  const scaleX = Math.cos((point[1] * Math.PI) / 180) * METRES_PER_DEGREE;
  const toLocal = (p: Position): [number, number] => [
    (p[0] - point[0]) * scaleX,
    (p[1] - point[1]) * METRES_PER_DEGREE,
  ];
  const toSegment = (a: Position, b: Position) => {
    const [ax, ay] = toLocal(a);
    const [bx, by] = toLocal(b);
    const dx = bx - ax;
    const dy = by - ay;
    const length = dx * dx + dy * dy;
    const t = length === 0 ? 0 : Math.max(0, Math.min(1, -(ax * dx + ay * dy) / length));
    return Math.hypot(ax + t * dx, ay + t * dy);
  };
  const toLine = (line: Position[]) => {
    let best = Infinity;
    for (let i = 0; i < line.length - 1; i++) best = Math.min(best, toSegment(line[i], line[i + 1]));
    return line.length === 1 ? Math.hypot(...toLocal(line[0])) : best;
  };
  let best = Infinity;
  flattenEach(feature, (part) => {
    const geometry = part.geometry;
    if (geometry.type === "Point") best = Math.min(best, Math.hypot(...toLocal(geometry.coordinates)));
    else if (geometry.type === "LineString") best = Math.min(best, toLine(geometry.coordinates));
    else if (geometry.type === "Polygon") {
      if (booleanPointInPolygon(point, geometry)) best = 0;
      else for (const ring of geometry.coordinates) best = Math.min(best, toLine(ring));
    }
  });
  return best;
}

/**
 * The nearest feature and its distance measured by turf. Features are first ranked by the quick
 * estimate; only those within 2 % (+ 5 m) of the closest estimate are measured properly.
 */
function nearest(point: Position, collection: FeatureCollection | null, fallback: string) {
  const rough = (collection?.features ?? [])
    .map((feature, index) => ({
      feature,
      index,
      metres: feature.geometry ? roughMetresToFeature(point, feature) : Infinity,
    }))
    .filter((candidate) => Number.isFinite(candidate.metres));
  if (rough.length === 0) return null;
  const closest = Math.min(...rough.map((candidate) => candidate.metres));
  let best: { name: string; metres: number } | null = null;
  for (const candidate of rough) {
    if (candidate.metres > closest * 1.02 + 5) continue;
    const metres = metresToFeature(point, candidate.feature);
    if (!best || metres < best.metres)
      best = { name: featureName(candidate.feature, `${fallback} ${candidate.index + 1}`), metres };
  }
  return best;
}

const roundMetres = (metres: number) => Math.round(metres * 100) / 100;

/**
 * Where a point sits against the agency's layers. A check whose layer is missing is null
 * ("not known"), never a guess.
 */
export function checkLocation(location: LatLon, layers: GeographyLayers, waterwayBufferM: number): GeographyChecks {
  const point: Position = [location.longitude, location.latitude];
  const waterway = nearest(point, layers.waterways, "Waterway");
  const inlet = nearest(point, layers.stormInlets, "Inlet");
  const boundary = areas(layers.jurisdiction);
  return {
    drainageBasin: drainageBasinAt(point, layers.drainageBasins),
    nearestWaterway: waterway?.name ?? null,
    nearestWaterwayM: waterway ? roundMetres(waterway.metres) : null,
    nearestInlet: inlet?.name ?? null,
    nearestInletM: inlet ? roundMetres(inlet.metres) : null,
    withinWaterwayBuffer: waterway ? waterway.metres <= waterwayBufferM : null,
    outsideJurisdiction: boundary.length ? !boundary.some((area) => booleanPointInPolygon(point, area)) : null,
  };
}

/** The waterway buffer as polygons, for drawing on the map (not used by the checks themselves). */
export function waterwayBufferArea(waterways: FeatureCollection | null, waterwayBufferM: number): FeatureCollection {
  const features: Feature[] = [];
  for (const feature of waterways?.features ?? []) {
    if (!feature.geometry) continue;
    const area = buffer(feature, waterwayBufferM, { units: "meters", steps: 6 });
    if (area) features.push({ ...area, properties: { name: featureName(feature, "Waterway") } });
  }
  return { type: "FeatureCollection", features };
}

/** A point on each feature (inside it, for polygons) with the feature's name, for map labels. */
export function labelPoints(collection: FeatureCollection | null): FeatureCollection {
  return {
    type: "FeatureCollection",
    features: (collection?.features ?? [])
      .filter((feature) => feature.geometry)
      .map((feature, index) => ({
        ...pointOnFeature(feature),
        properties: { name: featureName(feature, `Feature ${index + 1}`) },
      })),
  };
}
