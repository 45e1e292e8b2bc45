import { readFileSync } from "node:fs";
import { booleanPointInPolygon, distance } from "@turf/turf";
import fc from "fast-check";
import { Geodesic } from "geographiclib-geodesic";
import type { FeatureCollection, Position } from "geojson";
import { describe, expect, it } from "vitest";
import { searchAddresses } from "./addresses";
import {
  checkLocation,
  DEFAULT_WATERWAY_BUFFER_M,
  drainageBasinAt,
  metresToFeature,
  roughMetresToFeature,
} from "./checks";

const demo = (name: string) =>
  JSON.parse(readFileSync(`tiles/sources/alder-bend/${name}.geojson`, "utf8")) as FeatureCollection;
const layers = {
  drainageBasins: demo("drainage-basins"),
  waterways: demo("waterways"),
  stormInlets: demo("storm-inlets"),
  jurisdiction: demo("jurisdiction"),
};
const wgs84 = Geodesic.WGS84;

// turf measures on a sphere (mean radius 6,371,008.8 m); GeographicLib solves the WGS 84 ellipsoid.
// The sphere is off by at most about 0.5 % of the distance, so that is the tolerance we state:
// at 300 ft (91.44 m) it is under half a metre.
const RELATIVE_TOLERANCE = 0.005;

describe("distances against GeographicLib's geodesic (WGS 84)", () => {
  it("reproduces GeographicLib's documented case, and turf agrees within 0.5 %", () => {
    // Documented example: Inverse(-41.32, 174.81, 40.96, -5.50) gives s12 = 19,959,679.267 m.
    const reference = wgs84.Inverse(-41.32, 174.81, 40.96, -5.5).s12!;
    expect(reference).toBeCloseTo(19_959_679.267, 3);
    const turf = distance([174.81, -41.32], [-5.5, 40.96], { units: "meters" });
    expect(Math.abs(turf - reference) / reference).toBeLessThan(RELATIVE_TOLERANCE);
  });

  it("agrees for point pairs anywhere in the district (property-based)", () => {
    const lon = fc.double({ min: -98.32, max: -98.08, noNaN: true });
    const lat = fc.double({ min: 38.6, max: 38.8, noNaN: true });
    fc.assert(
      fc.property(lon, lat, lon, lat, (lon1, lat1, lon2, lat2) => {
        const reference = wgs84.Inverse(lat1, lon1, lat2, lon2).s12!;
        const turf = distance([lon1, lat1], [lon2, lat2], { units: "meters" });
        expect(Math.abs(turf - reference)).toBeLessThanOrEqual(Math.max(0.01, reference * RELATIVE_TOLERANCE));
      }),
      { numRuns: 300 },
    );
  });

  it("measures point-to-creek distances as GeographicLib does, within 0.5 %", () => {
    // Reference: the shortest WGS 84 geodesic from the point to each segment of the creek, found by a
    // ternary search along the segment's own geodesic.
    const geodesicToLine = (point: Position, line: Position[]) => {
      let best = Infinity;
      for (let i = 0; i < line.length - 1; i++) {
        const [a, b] = [line[i], line[i + 1]];
        const segment = wgs84.InverseLine(a[1], a[0], b[1], b[0]);
        const at = (s: number) => {
          const p = segment.Position(s);
          return wgs84.Inverse(point[1], point[0], p.lat2!, p.lon2!).s12!;
        };
        let [low, high] = [0, segment.s13];
        for (let step = 0; step < 80; step++) {
          const m1 = low + (high - low) / 3;
          const m2 = high - (high - low) / 3;
          if (at(m1) < at(m2)) high = m2;
          else low = m1;
        }
        best = Math.min(best, at((low + high) / 2), at(0), at(segment.s13));
      }
      return best;
    };
    const creek = layers.waterways.features.find((f) => f.properties?.name === "Alder Creek")!;
    const line = (creek.geometry as { coordinates: Position[] }).coordinates;
    const points: Position[] = [
      [-98.2, 38.7], // station S1 (demo)
      [-98.25, 38.65],
      [-98.15, 38.76],
      [-98.2101, 38.7041], // a few metres from the creek
    ];
    for (const point of points) {
      const reference = geodesicToLine(point, line);
      const ours = metresToFeature(point, creek);
      expect(Math.abs(ours - reference)).toBeLessThanOrEqual(Math.max(0.05, reference * RELATIVE_TOLERANCE));
    }
  });
});

describe("the quick pre-ranking of waterways", () => {
  it("stays within 1 % (+ 1 m) of turf, so the nearest waterway is never skipped (property-based)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -98.32, max: -98.08, noNaN: true }),
        fc.double({ min: 38.6, max: 38.8, noNaN: true }),
        (lon, lat) => {
          const distances = layers.waterways.features.map((feature) => ({
            exact: metresToFeature([lon, lat], feature),
            rough: roughMetresToFeature([lon, lat], feature),
            name: String(feature.properties?.name),
          }));
          for (const { exact, rough } of distances)
            expect(Math.abs(rough - exact)).toBeLessThanOrEqual(exact * 0.01 + 1);
          const bruteForce = distances.reduce((a, b) => (b.exact < a.exact ? b : a));
          const checks = checkLocation({ latitude: lat, longitude: lon }, layers, DEFAULT_WATERWAY_BUFFER_M);
          expect(checks.nearestWaterwayM).toBeCloseTo(bruteForce.exact, 1);
        },
      ),
      { numRuns: 200 },
    );
  });
});

describe("point in drainage basin, on and near the edges", () => {
  // Two unit squares sharing the divide x = 0 (counterclockwise rings, RFC 7946).
  const square = (west: number, name: string) => ({
    type: "Feature" as const,
    properties: { name },
    geometry: {
      type: "Polygon" as const,
      coordinates: [
        [
          [west, 0],
          [west + 1, 0],
          [west + 1, 1],
          [west, 1],
          [west, 0],
        ],
      ],
    },
  });
  const basins: FeatureCollection = { type: "FeatureCollection", features: [square(-1, "West"), square(0, "East")] };

  it("a point a tenth of a metre either side of a divide lands in the basin on its side", () => {
    expect(drainageBasinAt([-0.000001, 0.5], basins)).toBe("West");
    expect(drainageBasinAt([0.000001, 0.5], basins)).toBe("East");
  });

  it("a point exactly on a shared divide counts as inside, in the first basin listed", () => {
    expect(drainageBasinAt([0, 0.5], basins)).toBe("West");
    expect(drainageBasinAt([0, 0.5], { ...basins, features: [...basins.features].reverse() })).toBe("East");
    // A shared corner vertex too.
    expect(drainageBasinAt([0, 1], basins)).toBe("West");
  });

  it("the outer edge is inside; just beyond it is in no basin", () => {
    expect(drainageBasinAt([1, 0.5], basins)).toBe("East");
    expect(drainageBasinAt([1.000001, 0.5], basins)).toBeNull();
    expect(drainageBasinAt([0.5, -0.000001], basins)).toBeNull();
  });

  it("a hole in a basin polygon is not part of it", () => {
    const withHole: FeatureCollection = {
      type: "FeatureCollection",
      features: [
        {
          type: "Feature",
          properties: { name: "Ring" },
          geometry: {
            type: "Polygon",
            coordinates: [
              [
                [0, 0],
                [4, 0],
                [4, 4],
                [0, 4],
                [0, 0],
              ],
              [
                [1, 1],
                [1, 3],
                [3, 3],
                [3, 1],
                [1, 1],
              ],
            ],
          },
        },
      ],
    };
    expect(drainageBasinAt([2, 2], withHole)).toBeNull();
    expect(drainageBasinAt([0.5, 2], withHole)).toBe("Ring");
  });

  it("the demo district's four basins tile the jurisdiction: every point inside is in exactly one", () => {
    const boundary = layers.jurisdiction.features[0] as Parameters<typeof booleanPointInPolygon>[1];
    fc.assert(
      fc.property(
        fc.double({ min: -98.3, max: -98.1, noNaN: true }),
        fc.double({ min: 38.62, max: 38.78, noNaN: true }),
        (lon, lat) => {
          if (!booleanPointInPolygon([lon, lat], boundary, { ignoreBoundary: true })) return;
          const containing = layers.drainageBasins.features.filter((basin) =>
            booleanPointInPolygon([lon, lat], basin as Parameters<typeof booleanPointInPolygon>[1], {
              ignoreBoundary: true,
            }),
          );
          expect(containing.length).toBeLessThanOrEqual(1);
          expect(drainageBasinAt([lon, lat], layers.drainageBasins)).not.toBeNull();
        },
      ),
      { numRuns: 400 },
    );
  });
});

describe("checkLocation on the demo district (invented data)", () => {
  it("places station S1 in the South Fork basin, about 213 m from Alder Creek, outside the buffer", () => {
    const checks = checkLocation({ latitude: 38.7, longitude: -98.2 }, layers, DEFAULT_WATERWAY_BUFFER_M);
    expect(checks.drainageBasin).toBe("South Fork");
    expect(checks.nearestWaterway).toBe("Alder Creek");
    expect(checks.nearestWaterwayM).toBeGreaterThan(200);
    expect(checks.nearestWaterwayM).toBeLessThan(225);
    expect(checks.withinWaterwayBuffer).toBe(false);
    expect(checks.outsideJurisdiction).toBe(false);
    expect(checks.nearestInlet).toMatch(/^Inlet AB-\d{3}/);
    expect(checks.nearestInletM).toBeLessThan(400);
  });

  it("a point on Heron Pond is 0 m from water and inside the buffer", () => {
    const checks = checkLocation({ latitude: 38.724, longitude: -98.236 }, layers, DEFAULT_WATERWAY_BUFFER_M);
    expect(checks.nearestWaterway).toBe("Heron Pond");
    expect(checks.nearestWaterwayM).toBe(0);
    expect(checks.withinWaterwayBuffer).toBe(true);
  });

  it("the buffer is the agency's setting: 250 m puts S1 inside it", () => {
    expect(checkLocation({ latitude: 38.7, longitude: -98.2 }, layers, 250).withinWaterwayBuffer).toBe(true);
  });

  it("a point outside the district is flagged and in no basin", () => {
    const checks = checkLocation({ latitude: 38.9, longitude: -98.2 }, layers, DEFAULT_WATERWAY_BUFFER_M);
    expect(checks.outsideJurisdiction).toBe(true);
    expect(checks.drainageBasin).toBeNull();
  });

  it("a missing layer gives 'not known' (null), never a guess", () => {
    const checks = checkLocation(
      { latitude: 38.7, longitude: -98.2 },
      { drainageBasins: null, waterways: null, stormInlets: null, jurisdiction: null },
      DEFAULT_WATERWAY_BUFFER_M,
    );
    expect(Object.values(checks).every((value) => value === null)).toBe(true);
  });

  it("300 ft is 91.44 m exactly (definition of the foot)", () => {
    expect(DEFAULT_WATERWAY_BUFFER_M).toBe(300 * 0.3048);
  });
});

describe("address search on the district's own points", () => {
  const points = demo("address-points");
  it("finds a house by number and street, with common abbreviations", () => {
    const [first] = searchAddresses(points, "105 main st");
    expect(first.address).toBe("105 Main Street");
    expect(first.latitude).toBeCloseTo(38.7, 2);
  });
  it("returns nothing for an unknown street or an empty query", () => {
    expect(searchAddresses(points, "1 Nowhere Boulevard")).toEqual([]);
    expect(searchAddresses(points, "  ")).toEqual([]);
  });
});
