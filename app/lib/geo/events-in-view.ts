import type { EventFoamClasses, EventKind } from "~/lib/foam/vocabulary";
import type { BoundingBox } from "./map-filters";

/** The properties of one event on the usage map, as `/api/map/events.geojson` sends them. */
export type MappedEvent = {
  id: number;
  number: string;
  kind: EventKind;
  startedAt: string | null;
  foamClass: EventFoamClasses;
  pfasContaining: boolean;
  concentrateGal: number;
  drainageBasin: string | null;
  [other: string]: unknown;
};

export type MappedEventFeature = {
  type: "Feature";
  id?: number | string;
  geometry: { type: "Point"; coordinates: [number, number] };
  properties: MappedEvent;
};

export type EventsInView = {
  rows: { event: MappedEvent; coordinates: [number, number] }[];
  total: number;
};

/**
 * The events inside a bounding box (edges included, as the server's in-view totals count them),
 * most concentrate first, then by number; at most `limit` rows, with the full count.
 */
export function eventsInView(features: MappedEventFeature[], bbox: BoundingBox | null, limit: number): EventsInView {
  const inside = bbox
    ? features.filter((feature) => {
        const [longitude, latitude] = feature.geometry.coordinates;
        const [west, south, east, north] = bbox;
        return latitude >= south && latitude <= north && longitude >= west && longitude <= east;
      })
    : features;
  const sorted = [...inside].sort(
    (a, b) =>
      b.properties.concentrateGal - a.properties.concentrateGal ||
      a.properties.number.localeCompare(b.properties.number),
  );
  return {
    rows: sorted
      .slice(0, limit)
      .map((feature) => ({ event: feature.properties, coordinates: feature.geometry.coordinates })),
    total: inside.length,
  };
}
