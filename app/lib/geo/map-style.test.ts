import { describe, expect, it } from "vitest";
import { basemapStyle, CENSUS_CREDIT, DISTRICT_CREDIT } from "./map-style";

/**
 * The credits MapLibre shows at a zoom: those of the sources that have a layer drawn there (a layer
 * is drawn from its minzoom up to, not including, its maxzoom — the style specification's rule).
 */
function creditsAt(zoom: number): string[] {
  const style = basemapStyle("http://127.0.0.1");
  const used = new Set<string>();
  for (const layer of style.layers) {
    if (!("source" in layer) || typeof layer.source !== "string") continue;
    if ((layer.minzoom ?? 0) <= zoom && zoom < (layer.maxzoom ?? 24)) used.add(layer.source);
  }
  return [...used].map((id) => (style.sources[id] as { attribution?: string }).attribution ?? "").sort();
}

describe("the basemap's credits", () => {
  it("names the Census Bureau over the country and the district only where it is drawn", () => {
    expect(creditsAt(4)).toEqual([CENSUS_CREDIT]);
    expect(creditsAt(7)).toEqual([DISTRICT_CREDIT, CENSUS_CREDIT].sort());
  });

  it("credits the invented district alone at street zooms", () => {
    for (const zoom of [10, 12, 14, 17]) expect(creditsAt(zoom)).toEqual([DISTRICT_CREDIT]);
  });
});
