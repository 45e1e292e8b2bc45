import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { MAX_LAYER_BYTES, validateLayer } from "./layers";

const collection = (features: unknown[]) => JSON.stringify({ type: "FeatureCollection", features });
const basin = (ring: number[][], properties: Record<string, unknown> = { name: "Basin" }) => ({
  type: "Feature",
  properties,
  geometry: { type: "Polygon", coordinates: [ring] },
});
const square = [
  [-98.2, 38.7],
  [-98.1, 38.7],
  [-98.1, 38.8],
  [-98.2, 38.8],
  [-98.2, 38.7],
];

function errorsOf(result: ReturnType<typeof validateLayer>): string {
  if (result.ok) throw new Error("expected the layer to be refused");
  return result.errors.join(" ");
}

describe("validateLayer", () => {
  it("accepts each of the demo district's files (invented data)", () => {
    const files = {
      drainage_basins: "drainage-basins",
      waterways: "waterways",
      storm_inlets: "storm-inlets",
      jurisdiction: "jurisdiction",
      address_points: "address-points",
    } as const;
    for (const [kind, name] of Object.entries(files)) {
      const text = readFileSync(`tiles/sources/alder-bend/${name}.geojson`, "utf8");
      const result = validateLayer(kind as keyof typeof files, text);
      expect(result.ok, `${name}: ${result.ok ? "" : result.errors.join(" ")}`).toBe(true);
    }
  });

  it("refuses text that is not JSON, and JSON that is not a FeatureCollection", () => {
    expect(errorsOf(validateLayer("drainage_basins", "{ not json"))).toMatch(/not valid JSON/);
    expect(errorsOf(validateLayer("drainage_basins", "[]"))).toMatch(/FeatureCollection/);
    expect(errorsOf(validateLayer("drainage_basins", JSON.stringify({ type: "Topology" })))).toMatch(
      /"Topology".*FeatureCollection/,
    );
    expect(errorsOf(validateLayer("drainage_basins", ""))).toMatch(/empty/);
    expect(errorsOf(validateLayer("drainage_basins", collection([])))).toMatch(/no features/);
  });

  it("refuses projected coordinates (metres, not degrees) and names the position", () => {
    const projected = basin([
      [500000, 4280000],
      [510000, 4280000],
      [510000, 4290000],
      [500000, 4280000],
    ]);
    expect(errorsOf(validateLayer("drainage_basins", collection([projected])))).toMatch(
      /Feature 1: .*500000, 4280000.*WGS 84/,
    );
  });

  it("refuses a declared coordinate system other than WGS 84", () => {
    const text = JSON.stringify({
      type: "FeatureCollection",
      crs: { type: "name", properties: { name: "urn:ogc:def:crs:EPSG::26914" } },
      features: [basin(square)],
    });
    expect(errorsOf(validateLayer("drainage_basins", text))).toMatch(/EPSG::26914/);
  });

  it("refuses geometry types that do not fit the layer", () => {
    const point = { type: "Feature", properties: { name: "P" }, geometry: { type: "Point", coordinates: [-98, 38] } };
    expect(errorsOf(validateLayer("drainage_basins", collection([point])))).toMatch(/is a Point; drainage basins take/);
    expect(errorsOf(validateLayer("storm_inlets", collection([basin(square)])))).toMatch(/is a Polygon/);
  });

  it("refuses unclosed rings, short lines, missing geometry and missing names", () => {
    expect(
      errorsOf(validateLayer("drainage_basins", collection([basin(square.slice(0, 4).concat([[-98.2, 38.75]]))]))),
    ).toMatch(/not closed/);
    const shortLine = {
      type: "Feature",
      properties: { name: "Creek" },
      geometry: { type: "LineString", coordinates: [[-98, 38]] },
    };
    expect(errorsOf(validateLayer("waterways", collection([shortLine])))).toMatch(/at least 2 positions/);
    expect(
      errorsOf(validateLayer("waterways", collection([{ type: "Feature", properties: {}, geometry: null }]))),
    ).toMatch(/no geometry/);
    expect(errorsOf(validateLayer("drainage_basins", collection([basin(square, {})])))).toMatch(/no "name" property/);
  });

  it("lists a few problems and counts the rest", () => {
    const bad = Array.from({ length: 20 }, () => basin(square, {}));
    const result = validateLayer("drainage_basins", collection(bad));
    expect(errorsOf(result)).toMatch(/and 12 more problems/);
  });

  it("refuses a file over the size limit without parsing it", () => {
    const text = " ".repeat(MAX_LAYER_BYTES + 1);
    expect(errorsOf(validateLayer("waterways", text))).toMatch(/limit is 10 MB/);
  });

  it("accepts a single Feature as a one-feature collection", () => {
    const result = validateLayer("jurisdiction", JSON.stringify(basin(square, {})));
    expect(result.ok && result.featureCount).toBe(1);
  });
});
