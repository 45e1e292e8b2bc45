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
import { featureName } from "./layers";

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

function nearest(point: Position, collection: FeatureCollection | null, fallback: string) {
  let best: { name: string; metres: number } | null = null;
  collection?.features.forEach((feature, index) => {
    if (!feature.geometry) return;
    const metres = metresToFeature(point, feature);
    if (!best || metres < best.metres) best = { name: featureName(feature, `${fallback} ${index + 1}`), metres };
  });
  return best as { name: string; metres: number } | null;
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
