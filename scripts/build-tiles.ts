// Builds the basemap the app serves itself: vector tiles under tiles/basemap/{z}/{x}/{y}.pbf.
//
//   npm run tiles:build                          # US context + the invented Alder Bend district (demo)
//   npm run tiles:build -- --source DIR          # an agency's own GeoJSON files in DIR (same names)
//
// Low zooms: land, state and county lines from the us-atlas package (US Census Bureau cartographic
// boundaries, public domain). Street zooms: the district files (jurisdiction, drainage-basins,
// waterways, streets, storm-inlets, stations .geojson; any may be missing). Output is deterministic.
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import { bbox as boundingBox, centroid } from "@turf/turf";
import type { Feature, FeatureCollection, GeoJsonProperties, Geometry } from "geojson";
import GeoJSONVT from "geojson-vt";
import { feature as topoFeature, mesh } from "topojson-client";
import type { GeometryCollection, Topology } from "topojson-specification";
import vtpbf from "vt-pbf";

const require = createRequire(import.meta.url);
const args = process.argv.slice(2);
const sourceArg = args.indexOf("--source");
const SOURCE = path.resolve(sourceArg >= 0 ? args[sourceArg + 1] : "tiles/sources/alder-bend");
const OUT = path.resolve("tiles/basemap");
const MAX_ZOOM = 14;

type Collection = FeatureCollection<Geometry, GeoJsonProperties>;
const collection = (features: Feature[]): Collection => ({ type: "FeatureCollection", features });

function readSource(name: string): Collection {
  const file = path.join(SOURCE, name);
  if (!existsSync(file)) return collection([]);
  return JSON.parse(readFileSync(file, "utf8")) as Collection;
}

// Only the properties the style uses go into the tiles.
function keep(fc: Collection, names: string[]): Collection {
  return collection(
    fc.features.map((f) => ({
      type: "Feature",
      geometry: f.geometry,
      properties: Object.fromEntries(names.filter((n) => f.properties?.[n] != null).map((n) => [n, f.properties![n]])),
    })),
  );
}

// --- US context (us-atlas, unprojected longitude/latitude, 1:10m) ---
const us = require("us-atlas/counties-10m.json") as Topology;
const statesObject = us.objects.states as GeometryCollection<{ name: string }>;
const countiesObject = us.objects.counties as GeometryCollection<{ name: string }>;
const nation = topoFeature(us, us.objects.nation) as unknown as Collection;
const stateLines = collection([
  { type: "Feature", properties: {}, geometry: mesh(us, statesObject, (a, b) => a !== b) },
]);
const countyLines = collection([
  { type: "Feature", properties: {}, geometry: mesh(us, countiesObject, (a, b) => a !== b) },
]);
const states = topoFeature(us, statesObject) as unknown as Collection;
const counties = topoFeature(us, countiesObject) as unknown as Collection;
const labelPoints = (fc: Collection) =>
  collection(fc.features.map((f) => ({ ...centroid(f), properties: { name: f.properties?.name ?? "" } })));

// --- The district ---
const jurisdiction = readSource("jurisdiction.geojson");
const district = {
  district: keep(jurisdiction, ["name"]),
  basins: keep(readSource("drainage-basins.geojson"), ["name"]),
  water: keep(readSource("waterways.geojson"), ["name", "kind"]),
  roads: keep(readSource("streets.geojson"), ["name", "kind"]),
  inlets: keep(readSource("storm-inlets.geojson"), ["name"]),
  stations: keep(readSource("stations.geojson"), ["name", "code"]),
};
const districtFeatures = Object.values(district).flatMap((fc) => fc.features);
const [west, south, east, north] = districtFeatures.length
  ? boundingBox(collection(districtFeatures))
  : [-98.32, 38.6, -98.08, 38.8];

// Which layers appear from which zoom (keeps low-zoom tiles small).
const LAYERS: { name: string; data: Collection; minZoom: number }[] = [
  { name: "land", data: nation, minZoom: 0 },
  { name: "state_lines", data: stateLines, minZoom: 0 },
  { name: "state_labels", data: labelPoints(states), minZoom: 3 },
  { name: "county_lines", data: countyLines, minZoom: 6 },
  { name: "county_labels", data: labelPoints(counties), minZoom: 8 },
  { name: "district", data: district.district, minZoom: 6 },
  { name: "basins", data: district.basins, minZoom: 10 },
  { name: "water", data: district.water, minZoom: 9 },
  { name: "roads", data: district.roads, minZoom: 11 },
  { name: "inlets", data: district.inlets, minZoom: 14 },
  { name: "stations", data: district.stations, minZoom: 10 },
];

// Tiles are written for: the whole country at z0–5, a wide box around the district at z6–9,
// and the district itself at z10–14 (the map over-zooms z14 tiles beyond that).
function tileRange(z: number): { x0: number; x1: number; y0: number; y1: number } {
  const pad = z <= 5 ? null : z <= 9 ? 4 : 0.02;
  const box = pad === null ? [-180, 5, -60, 72] : [west - pad, south - pad, east + pad, north + pad];
  const n = 2 ** z;
  const x = (lon: number) => Math.min(n - 1, Math.max(0, Math.floor(((lon + 180) / 360) * n)));
  const y = (lat: number) => {
    const rad = (lat * Math.PI) / 180;
    const value = Math.floor(((1 - Math.log(Math.tan(rad) + 1 / Math.cos(rad)) / Math.PI) / 2) * n);
    return Math.min(n - 1, Math.max(0, value));
  };
  return { x0: x(box[0]), x1: x(box[2]), y0: y(box[3]), y1: y(box[1]) };
}

const indexes = LAYERS.map((layer) => ({
  ...layer,
  index: new GeoJSONVT(layer.data, { maxZoom: MAX_ZOOM, indexMaxZoom: 4, tolerance: 3, buffer: 64 }),
}));

rmSync(OUT, { recursive: true, force: true });
let files = 0;
let bytes = 0;
for (let z = 0; z <= MAX_ZOOM; z++) {
  const { x0, x1, y0, y1 } = tileRange(z);
  for (let x = x0; x <= x1; x++) {
    for (let y = y0; y <= y1; y++) {
      const layers: Record<string, NonNullable<ReturnType<GeoJSONVT["getTile"]>>> = {};
      for (const layer of indexes) {
        if (z < layer.minZoom) continue;
        const tile = layer.index.getTile(z, x, y);
        if (tile && tile.features.length > 0) layers[layer.name] = tile;
      }
      if (Object.keys(layers).length === 0) continue;
      const buffer = vtpbf.fromGeojsonVt(layers, { version: 2 });
      mkdirSync(path.join(OUT, String(z), String(x)), { recursive: true });
      writeFileSync(path.join(OUT, String(z), String(x), `${y}.pbf`), buffer);
      files += 1;
      bytes += buffer.length;
    }
  }
}
const metadata = {
  name: "Foamtally basemap",
  minzoom: 0,
  maxzoom: MAX_ZOOM,
  bounds: [west, south, east, north],
  center: [(west + east) / 2, (south + north) / 2, 12],
  layers: LAYERS.map(({ name, minZoom }) => ({ name, minZoom })),
  attribution:
    "US boundaries: US Census Bureau via us-atlas (public domain). District: " +
    (SOURCE.endsWith("alder-bend") ? "Alder Bend Fire District (demo data, invented)" : path.basename(SOURCE)),
};
writeFileSync(path.join(OUT, "metadata.json"), JSON.stringify(metadata, null, 2) + "\n");
console.log(`Wrote ${files} tiles (${(bytes / 1024).toFixed(0)} KB) to ${path.relative(process.cwd(), OUT)}`);
