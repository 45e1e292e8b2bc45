// Writes the invented Alder Bend Fire District's geography (demo data) as GeoJSON under
// tiles/sources/alder-bend/. Deterministic: the same files every run. The output is committed;
// run again only to change the invented district: `tsx scripts/make-demo-geography.ts`.
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { rewind } from "@turf/turf";
import type { Feature, FeatureCollection, Geometry, Position } from "geojson";

const OUT = path.resolve("tiles/sources/alder-bend");
const DEMO = "Alder Bend Fire District (demo data, invented)";

const round = (value: number) => Math.round(value * 1e6) / 1e6;
const pos = (lon: number, lat: number): Position => [round(lon), round(lat)];

function collection(features: Feature[]): FeatureCollection {
  return { type: "FeatureCollection", features };
}
function feature(geometry: Geometry, properties: Record<string, unknown>): Feature {
  return { type: "Feature", properties, geometry };
}

// District frame and the two basin divides, which cross at DIVIDE_CROSSING.
const WEST = -98.315;
const EAST = -98.085;
const SOUTH = 38.605;
const NORTH = 38.795;
const CROSSING = pos(-98.185, 38.716);
// North–south divide, north to south, with a gentle wiggle.
const divideNorth: Position[] = [pos(-98.19, NORTH), pos(-98.182, 38.76), pos(-98.192, 38.74), CROSSING];
const divideSouth: Position[] = [CROSSING, pos(-98.176, 38.69), pos(-98.19, 38.66), pos(-98.18, SOUTH)];
// West–east divide, west to east.
const divideWest: Position[] = [pos(WEST, 38.724), pos(-98.26, 38.73), pos(-98.22, 38.722), CROSSING];
const divideEast: Position[] = [CROSSING, pos(-98.16, 38.71), pos(-98.13, 38.718), pos(EAST, 38.712)];

const reversed = (line: Position[]) => [...line].reverse();
function ring(...parts: Position[][]): Position[] {
  const points: Position[] = [];
  for (const part of parts) {
    for (const point of part) {
      const last = points[points.length - 1];
      if (!last || last[0] !== point[0] || last[1] !== point[1]) points.push(point);
    }
  }
  const [first, last] = [points[0], points[points.length - 1]];
  if (first[0] !== last[0] || first[1] !== last[1]) points.push(first);
  return points;
}

const basins = collection([
  feature(
    {
      type: "Polygon",
      coordinates: [ring([pos(WEST, NORTH)], divideNorth, reversed(divideWest))],
    },
    { name: "Upper Alder", source: DEMO },
  ),
  feature(
    {
      type: "Polygon",
      coordinates: [ring([pos(EAST, NORTH)], reversed(divideEast), reversed(divideNorth))],
    },
    { name: "Millrace", source: DEMO },
  ),
  feature(
    {
      type: "Polygon",
      coordinates: [ring(divideWest, divideSouth, [pos(WEST, SOUTH)])],
    },
    { name: "South Fork", source: DEMO },
  ),
  feature(
    {
      type: "Polygon",
      coordinates: [ring(divideEast, [pos(EAST, SOUTH)], reversed(divideSouth))],
    },
    { name: "Lower Alder", source: DEMO },
  ),
]);

const jurisdiction = collection([
  feature(
    {
      type: "Polygon",
      coordinates: [
        [
          pos(WEST, SOUTH),
          pos(-98.18, SOUTH),
          pos(EAST, SOUTH),
          pos(EAST, 38.712),
          pos(EAST, NORTH),
          pos(-98.19, NORTH),
          pos(WEST, NORTH),
          pos(WEST, 38.724),
          pos(WEST, SOUTH),
        ],
      ],
    },
    { name: "Alder Bend Fire District (demo)", source: DEMO },
  ),
]);

// Creeks: a smooth meander through control points.
function meander(points: [number, number][], wobble: number, steps = 8): Position[] {
  const line: Position[] = [];
  for (let i = 0; i < points.length - 1; i++) {
    const [x0, y0] = points[i];
    const [x1, y1] = points[i + 1];
    for (let s = 0; s < steps; s++) {
      const t = s / steps;
      const bend = Math.sin((i * steps + s) * 0.9) * wobble;
      line.push(pos(x0 + (x1 - x0) * t, y0 + (y1 - y0) * t + bend));
    }
  }
  const [xe, ye] = points[points.length - 1];
  line.push(pos(xe, ye));
  return line;
}

const alderCreek = meander(
  [
    [-98.318, 38.716],
    [-98.27, 38.712],
    [-98.235, 38.706],
    [-98.205, 38.7035],
    [-98.17, 38.698],
    [-98.135, 38.692],
    [-98.085, 38.688],
  ],
  0.0012,
);
const millraceRun = meander(
  [
    [-98.12, 38.795],
    [-98.14, 38.765],
    [-98.152, 38.738],
    [-98.162, 38.715],
    [-98.17, 38.698],
  ],
  0.001,
);
const southForkCreek = meander(
  [
    [-98.295, 38.605],
    [-98.27, 38.63],
    [-98.25, 38.652],
    [-98.232, 38.675],
    [-98.215, 38.692],
    [-98.205, 38.7035],
  ],
  0.0009,
);
function pond(centreLon: number, centreLat: number, radiusLon: number, radiusLat: number): Position[] {
  const points: Position[] = [];
  for (let i = 0; i < 24; i++) {
    const angle = (i / 24) * 2 * Math.PI;
    const wobble = 1 + 0.12 * Math.sin(angle * 3);
    points.push(
      pos(centreLon + Math.cos(angle) * radiusLon * wobble, centreLat + Math.sin(angle) * radiusLat * wobble),
    );
  }
  points.push(points[0]);
  return points;
}

const waterways = collection([
  feature({ type: "LineString", coordinates: alderCreek }, { name: "Alder Creek", kind: "creek", source: DEMO }),
  feature({ type: "LineString", coordinates: millraceRun }, { name: "Millrace Run", kind: "creek", source: DEMO }),
  feature(
    { type: "LineString", coordinates: southForkCreek },
    { name: "South Fork Alder Creek", kind: "creek", source: DEMO },
  ),
  feature(
    { type: "Polygon", coordinates: [pond(-98.236, 38.724, 0.0035, 0.0022)] },
    { name: "Heron Pond", kind: "pond", source: DEMO },
  ),
]);

// Streets: a small grid around each station plus the roads that join them.
type Street = { name: string; coordinates: Position[]; kind: "street" | "road" };
const streets: Street[] = [];
function grid(
  prefix: string,
  centreLon: number,
  centreLat: number,
  eastWest: string[],
  northSouth: string[],
  spacing: number,
) {
  const halfLon = ((northSouth.length - 1) / 2) * spacing * 1.25;
  const halfLat = ((eastWest.length - 1) / 2) * spacing;
  eastWest.forEach((name, i) => {
    const lat = centreLat - halfLat + i * spacing;
    streets.push({
      name,
      kind: "street",
      coordinates: [pos(centreLon - halfLon - 0.002, lat), pos(centreLon + halfLon + 0.002, lat)],
    });
  });
  northSouth.forEach((name, i) => {
    const lon = centreLon - halfLon + i * spacing * 1.25;
    streets.push({
      name,
      kind: "street",
      coordinates: [pos(lon, centreLat - halfLat - 0.0015), pos(lon, centreLat + halfLat + 0.0015)],
    });
  });
  void prefix;
}
// Central town: S1 stands at 38.7000, -98.2000 on Main Street.
grid(
  "central",
  -98.2,
  38.7,
  ["Willow Street", "Cedar Street", "Main Street", "Depot Street", "Orchard Street"],
  ["1st Avenue", "2nd Avenue", "3rd Avenue", "Station Avenue", "5th Avenue", "6th Avenue"],
  0.0032,
);
// Millrace village: S2 at 38.7350, -98.1500.
grid(
  "millrace",
  -98.15,
  38.735,
  ["Mill Lane", "Wheel Street", "Sluice Street"],
  ["Grist Avenue", "Dam Avenue", "Race Avenue"],
  0.003,
);
// South Fork hamlet: S3 at 38.6550, -98.2450.
grid(
  "south",
  -98.245,
  38.655,
  ["Fork Street", "Ford Street", "Meadow Street"],
  ["Pine Avenue", "Elm Avenue", "Ash Avenue"],
  0.003,
);
streets.push(
  { name: "Alder Bend Road", kind: "road", coordinates: [pos(-98.3, 38.7), pos(-98.21, 38.7)] },
  { name: "Alder Bend Road", kind: "road", coordinates: [pos(-98.19, 38.7), pos(-98.1, 38.7)] },
  {
    name: "Millrace Road",
    kind: "road",
    coordinates: [pos(-98.19, 38.7064), pos(-98.175, 38.716), pos(-98.16, 38.728), pos(-98.1563, 38.735)],
  },
  {
    name: "South Fork Road",
    kind: "road",
    coordinates: [pos(-98.2125, 38.6936), pos(-98.222, 38.68), pos(-98.238, 38.665), pos(-98.2488, 38.655)],
  },
  { name: "County Road 8", kind: "road", coordinates: [pos(-98.26, 38.62), pos(-98.26, 38.78)] },
  { name: "County Road 14", kind: "road", coordinates: [pos(-98.3, 38.75), pos(-98.1, 38.75)] },
);

const roads = collection(
  streets.map((street) =>
    feature(
      { type: "LineString", coordinates: street.coordinates },
      { name: street.name, kind: street.kind, source: DEMO },
    ),
  ),
);

// Storm inlets: at street corners in the three settlements (not along the county roads).
const inlets: Feature[] = [];
const townStreets = streets.filter((street) => street.kind === "street");
let inletNumber = 0;
for (const street of townStreets) {
  const [start, end] = street.coordinates;
  const segments = 4;
  for (let i = 1; i < segments; i++) {
    const t = i / segments;
    inletNumber += 1;
    const code = `AB-${String(inletNumber).padStart(3, "0")}`;
    const offset = 0.00008;
    const lon = start[0] + (end[0] - start[0]) * t + (start[0] === end[0] ? offset : 0);
    const lat = start[1] + (end[1] - start[1]) * t + (start[1] === end[1] ? offset : 0);
    inlets.push(
      feature({ type: "Point", coordinates: pos(lon, lat) }, { name: `Inlet ${code} (${street.name})`, source: DEMO }),
    );
  }
}

// Address points: house numbers along each street, odd on one side, even on the other.
const addresses: Feature[] = [];
for (const street of streets) {
  const points = street.coordinates;
  let house = street.kind === "road" ? 1000 : 100;
  for (let i = 0; i < points.length - 1; i++) {
    const [x0, y0] = points[i];
    const [x1, y1] = points[i + 1];
    const metres = Math.hypot((x1 - x0) * 87_000, (y1 - y0) * 111_000);
    const step = street.kind === "road" ? 400 : 45;
    const count = Math.floor(metres / step);
    const nx = -(y1 - y0) / (metres || 1);
    const ny = (x1 - x0) / (metres || 1);
    for (let k = 1; k < count; k++) {
      const t = k / count;
      for (const side of [1, -1]) {
        const number = house + (side === 1 ? 1 : 2);
        const lon = x0 + (x1 - x0) * t + side * nx * 18 * 1e-5 * 1.1;
        const lat = y0 + (y1 - y0) * t + side * ny * 18 * 1e-5 * 0.9;
        addresses.push(
          feature({ type: "Point", coordinates: pos(lon, lat) }, { address: `${number} ${street.name}`, source: DEMO }),
        );
      }
      house += street.kind === "road" ? 20 : 4;
    }
  }
}

const stations = collection([
  feature({ type: "Point", coordinates: pos(-98.2, 38.7) }, { code: "S1", name: "Alder Bend Central", source: DEMO }),
  feature({ type: "Point", coordinates: pos(-98.15, 38.735) }, { code: "S2", name: "Millrace", source: DEMO }),
  feature({ type: "Point", coordinates: pos(-98.245, 38.655) }, { code: "S3", name: "South Fork", source: DEMO }),
]);

mkdirSync(OUT, { recursive: true });
const files: Record<string, FeatureCollection> = {
  "jurisdiction.geojson": jurisdiction,
  "drainage-basins.geojson": basins,
  "waterways.geojson": waterways,
  "storm-inlets.geojson": collection(inlets),
  "streets.geojson": roads,
  "address-points.geojson": collection(addresses),
  "stations.geojson": stations,
};
for (const [name, data] of Object.entries(files)) {
  // RFC 7946 §3.1.6: exterior rings counterclockwise.
  rewind(data, { mutate: true });
  writeFileSync(path.join(OUT, name), JSON.stringify(data) + "\n");
  console.log(`${name}: ${data.features.length} features`);
}
