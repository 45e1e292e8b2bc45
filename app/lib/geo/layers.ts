import type { Feature, FeatureCollection, Geometry, Position } from "geojson";

/** The layers the geography checks use, and the address points the form searches. */
export const LAYER_KINDS = ["drainage_basins", "waterways", "storm_inlets", "jurisdiction", "address_points"] as const;
export type LayerKind = (typeof LAYER_KINDS)[number];

export function isLayerKind(value: unknown): value is LayerKind {
  return typeof value === "string" && (LAYER_KINDS as readonly string[]).includes(value);
}

type LayerRule = {
  label: string;
  geometryTypes: Geometry["type"][];
  /** The property that names each feature, or null when names are optional. */
  nameProperty: "name" | "address" | null;
  help: string;
};

export const LAYER_RULES: Record<LayerKind, LayerRule> = {
  drainage_basins: {
    label: "Drainage basins",
    geometryTypes: ["Polygon", "MultiPolygon"],
    nameProperty: "name",
    help: "Polygons, each with a name property.",
  },
  waterways: {
    label: "Waterways",
    geometryTypes: ["LineString", "MultiLineString", "Polygon", "MultiPolygon"],
    nameProperty: "name",
    help: "Creek and river lines, and pond or lake polygons, each with a name property.",
  },
  storm_inlets: {
    label: "Storm inlets",
    geometryTypes: ["Point", "MultiPoint"],
    nameProperty: null,
    help: "Points; a name or id property is shown when present.",
  },
  jurisdiction: {
    label: "Jurisdiction boundary",
    geometryTypes: ["Polygon", "MultiPolygon"],
    nameProperty: null,
    help: "The agency's boundary as one or more polygons.",
  },
  address_points: {
    label: "Address points",
    geometryTypes: ["Point"],
    nameProperty: "address",
    help: "Points with an address property (house number and street), searched by the event form.",
  },
};

/** Larger files are refused: a district's layers are far smaller, and the server parses them in memory. */
export const MAX_LAYER_BYTES = 10 * 1024 * 1024;
export const MAX_LAYER_FEATURES = 50_000;
const MAX_LISTED_ERRORS = 8;

export type LayerValidation =
  { ok: true; collection: FeatureCollection; featureCount: number } | { ok: false; errors: string[] };

/** A display name for a feature of a layer, falling back to common property spellings. */
export function featureName(feature: Feature, fallback: string): string {
  const properties = feature.properties ?? {};
  for (const key of ["name", "NAME", "Name", "address", "id", "ID", "label"]) {
    const value = properties[key];
    if (typeof value === "string" && value.trim()) return value.trim();
    if (typeof value === "number") return String(value);
  }
  return fallback;
}

function isPosition(value: unknown): value is Position {
  return (
    Array.isArray(value) &&
    (value.length === 2 || value.length === 3) &&
    value.every((n) => typeof n === "number" && Number.isFinite(n))
  );
}

/** Checks the coordinates of one geometry (RFC 7946 §3.1); returns the first problem, or null. */
function geometryProblem(geometry: Geometry): string | null {
  const position = (p: unknown): string | null => {
    if (!isPosition(p)) return "a position is not [longitude, latitude] numbers";
    const [lon, lat] = p;
    if (lon < -180 || lon > 180 || lat < -90 || lat > 90) {
      return `the position [${lon}, ${lat}] is outside WGS 84 longitude −180…180 / latitude −90…90 (projected coordinates are not accepted; export as EPSG:4326)`;
    }
    return null;
  };
  const line = (coords: unknown, minimum: number): string | null => {
    if (!Array.isArray(coords) || coords.length < minimum) return `a line needs at least ${minimum} positions`;
    for (const p of coords) {
      const problem = position(p);
      if (problem) return problem;
    }
    return null;
  };
  const ringOf = (coords: unknown): string | null => {
    const problem = line(coords, 4);
    if (problem) return problem.replace("a line", "a polygon ring");
    const ring = coords as Position[];
    const [first, last] = [ring[0], ring[ring.length - 1]];
    if (first[0] !== last[0] || first[1] !== last[1])
      return "a polygon ring is not closed (first and last positions differ)";
    return null;
  };
  const polygon = (coords: unknown): string | null => {
    if (!Array.isArray(coords) || coords.length === 0) return "a polygon has no rings";
    for (const ring of coords) {
      const problem = ringOf(ring);
      if (problem) return problem;
    }
    return null;
  };
  const many = (coords: unknown, check: (c: unknown) => string | null): string | null => {
    if (!Array.isArray(coords) || coords.length === 0) return "a multi-part geometry has no parts";
    for (const part of coords) {
      const problem = check(part);
      if (problem) return problem;
    }
    return null;
  };
  switch (geometry.type) {
    case "Point":
      return position(geometry.coordinates);
    case "MultiPoint":
      return many(geometry.coordinates, position);
    case "LineString":
      return line(geometry.coordinates, 2);
    case "MultiLineString":
      return many(geometry.coordinates, (c) => line(c, 2));
    case "Polygon":
      return polygon(geometry.coordinates);
    case "MultiPolygon":
      return many(geometry.coordinates, polygon);
    default:
      return "geometry collections are not accepted; split them into features";
  }
}

/**
 * Validates an uploaded layer: RFC 7946 FeatureCollection, WGS 84 coordinates in range, geometry
 * types that fit the layer, a size limit. Returns every problem found (up to a few), never throws.
 */
export function validateLayer(kind: LayerKind, text: string): LayerValidation {
  const rule = LAYER_RULES[kind];
  const bytes = new TextEncoder().encode(text).length;
  if (bytes === 0) return { ok: false, errors: ["The file is empty."] };
  if (bytes > MAX_LAYER_BYTES) {
    return {
      ok: false,
      errors: [`The file is ${(bytes / 1024 / 1024).toFixed(1)} MB; the limit is ${MAX_LAYER_BYTES / 1024 / 1024} MB.`],
    };
  }
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch {
    return { ok: false, errors: ["The file is not valid JSON, so it cannot be GeoJSON."] };
  }
  if (!parsed || typeof parsed !== "object" || Array.isArray(parsed)) {
    return { ok: false, errors: ["The file must hold a GeoJSON FeatureCollection object."] };
  }
  const root = parsed as Record<string, unknown>;
  if (root.type === "Feature") {
    return validateFeatures(rule, [root]);
  }
  if (root.type !== "FeatureCollection" || !Array.isArray(root.features)) {
    return {
      ok: false,
      errors: [`The file's type is ${JSON.stringify(root.type ?? null)}; a GeoJSON FeatureCollection is needed.`],
    };
  }
  const crs = root.crs as { properties?: { name?: unknown } } | undefined;
  const crsName = crs?.properties?.name;
  if (crs && crsName != null && typeof crsName !== "string") {
    return { ok: false, errors: ['The file\'s "crs" name is not a string; GeoJSON (RFC 7946) uses WGS 84 only.'] };
  }
  if (crs && !/CRS84|4326/i.test(typeof crsName === "string" ? crsName : "")) {
    return {
      ok: false,
      errors: [
        `The file declares the coordinate system ${JSON.stringify(crs.properties?.name ?? crs)}; GeoJSON (RFC 7946) uses WGS 84 longitude/latitude only. Export as EPSG:4326.`,
      ],
    };
  }
  return validateFeatures(rule, root.features);
}

function validateFeatures(rule: LayerRule, items: unknown[]): LayerValidation {
  if (items.length === 0) return { ok: false, errors: ["The file holds no features."] };
  if (items.length > MAX_LAYER_FEATURES) {
    return { ok: false, errors: [`The file holds ${items.length} features; the limit is ${MAX_LAYER_FEATURES}.`] };
  }
  const errors: string[] = [];
  let problems = 0;
  const features: Feature[] = [];
  items.forEach((item, index) => {
    const where = `Feature ${index + 1}`;
    const note = (message: string) => {
      problems += 1;
      if (errors.length < MAX_LISTED_ERRORS) errors.push(`${where}: ${message}.`);
    };
    if (!item || typeof item !== "object" || (item as { type?: unknown }).type !== "Feature") {
      note("is not a GeoJSON Feature");
      return;
    }
    const candidate = item as Feature;
    const geometry = candidate.geometry as Geometry | null | undefined;
    if (!geometry || typeof geometry !== "object") {
      note("has no geometry");
      return;
    }
    if (typeof geometry.type !== "string") {
      note('has a geometry whose "type" is not a string');
      return;
    }
    if (!rule.geometryTypes.includes(geometry.type)) {
      note(`is a ${geometry.type.slice(0, 40)}; ${rule.label.toLowerCase()} take ${rule.geometryTypes.join(", ")}`);
      return;
    }
    const problem = geometryProblem(geometry);
    if (problem) {
      note(problem);
      return;
    }
    const properties = candidate.properties && typeof candidate.properties === "object" ? candidate.properties : {};
    if (rule.nameProperty) {
      const value = properties[rule.nameProperty] ?? properties[rule.nameProperty.toUpperCase()];
      if (typeof value !== "string" || value.trim() === "") {
        note(`has no "${rule.nameProperty}" property`);
        return;
      }
    }
    features.push({ type: "Feature", properties, geometry });
  });
  if (problems > 0) {
    if (problems > errors.length) errors.push(`…and ${problems - errors.length} more problems.`);
    return { ok: false, errors };
  }
  return { ok: true, collection: { type: "FeatureCollection", features }, featureCount: features.length };
}
