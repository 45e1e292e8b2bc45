import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { cutIntoPieces, pieceText, type MapEventCollection } from "./usage-map.server";

/** The collection's JSON written piece by piece, as the map's events are. */
const geoJsonPieces = (collection: MapEventCollection): string[] => [
  '{"type":"FeatureCollection","features":[',
  ...cutIntoPieces(collection.features, (feature) => feature.properties.id).map((features, index) =>
    pieceText(features, index === 0),
  ),
  "]}",
];

const collectionOf = (ids: number[]): MapEventCollection => ({
  type: "FeatureCollection",
  features: ids.map((id) => ({
    type: "Feature",
    geometry: { type: "Point", coordinates: [-93.1, 44.9] },
    properties: { id, number: `D-${id}`, address: "100 Demo Way, Alder Bend (demo)" } as never,
  })),
});

describe("the map events' pieces", () => {
  it("joins to exactly what JSON.stringify writes", () => {
    fc.assert(
      fc.property(fc.uniqueArray(fc.integer({ min: 1, max: 1_000_000 }), { maxLength: 400 }), (ids) => {
        const collection = collectionOf(ids);
        expect(geoJsonPieces(collection).join("")).toBe(JSON.stringify(collection));
      }),
    );
  });

  it("changes only the piece of an event added in the middle", () => {
    const ids = Array.from({ length: 2000 }, (_, index) => index + 1);
    const before = geoJsonPieces(collectionOf(ids));
    const after = geoJsonPieces(collectionOf([...ids.slice(0, 1000), 5000, ...ids.slice(1000)]));
    expect(before.length).toBeGreaterThan(10);
    const unchanged = after.filter((piece) => before.includes(piece));
    expect(unchanged.length).toBe(after.length - 1);
  });
});
