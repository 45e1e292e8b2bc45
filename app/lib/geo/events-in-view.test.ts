import { describe, expect, it } from "vitest";
import { eventsInView, type MappedEventFeature } from "./events-in-view";

function feature(number: string, longitude: number, latitude: number, concentrateGal: number): MappedEventFeature {
  return {
    type: "Feature",
    geometry: { type: "Point", coordinates: [longitude, latitude] },
    properties: {
      id: number.length,
      number,
      kind: "incident",
      startedAt: null,
      foamClass: "A",
      pfasContaining: false,
      concentrateGal,
      drainageBasin: null,
      url: `/events/${number.length}`,
    },
  };
}

describe("eventsInView", () => {
  const features = [
    feature("E-1", -98.2, 38.7, 5),
    feature("E-2", -98.3, 38.8, 40),
    feature("E-3", -98.1, 38.6, 12),
    feature("E-4", -98.2, 38.7, 12),
  ];

  it("keeps the events inside the box, edges included, most concentrate first", () => {
    const view = eventsInView(features, [-98.25, 38.6, -98.1, 38.75], 50);
    expect(view.total).toBe(3);
    expect(view.rows.map((row) => row.event.number)).toEqual(["E-3", "E-4", "E-1"]);
    expect(view.rows[0].coordinates).toEqual([-98.1, 38.6]);
  });

  it("caps the rows and still counts every event in view", () => {
    const view = eventsInView(features, null, 2);
    expect(view.total).toBe(4);
    expect(view.rows.map((row) => row.event.number)).toEqual(["E-2", "E-3"]);
  });

  it("finds nothing in a box away from every event", () => {
    expect(eventsInView(features, [-90, 30, -89, 31], 50)).toEqual({ rows: [], total: 0 });
  });
});
