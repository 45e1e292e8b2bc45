import type { ExpressionSpecification, GeoJSONSource, Map as MapLibreMap, MapLayerMouseEvent } from "maplibre-gl";
import { useEffect, useRef, useState, type RefObject } from "react";
import { EVENT_KIND_LABELS, eventFoamClassesLabel, type EventFoamClasses, type EventKind } from "~/lib/foam/vocabulary";
import type { MappedEventFeature } from "~/lib/geo/events-in-view";
import type { BoundingBox } from "~/lib/geo/map-filters";
import { basemapStyle, DISTRICT_BOUNDS, MAP_COLOURS } from "~/lib/geo/map-style";
import { loadMapLibre } from "./maplibre-loader";

export const FOAM_CLASS_COLOURS = { A: "#3f7d20", B: "#5b3fa6", "A+B": "#b86a00", none: "#6b7280" } as const;
export const PFAS_RING = "#9d1c1c";

export const OVERLAYS = [
  { id: "basins", label: "Drainage basins" },
  { id: "waterways", label: "Waterways" },
  { id: "buffer", label: "Waterway buffer" },
  { id: "inlets", label: "Storm inlets" },
] as const;
export type OverlayId = (typeof OVERLAYS)[number]["id"];

const OVERLAY_LAYERS: Record<OverlayId, string[]> = {
  basins: ["overlay-basins-fill", "overlay-basins-line", "overlay-basins-label"],
  waterways: ["overlay-waterways-line", "overlay-waterways-fill"],
  buffer: ["overlay-buffer"],
  inlets: ["overlay-inlets"],
};

type Props = {
  /** Query string of /api/map/events.geojson (from, to, class, kind, station) without bbox. */
  eventsQuery: string;
  /** The agency's time zone, for the times in popups. */
  timeZone: string;
  overlays: Record<OverlayId, boolean>;
  onViewChange: (bbox: BoundingBox) => void;
  /** Called with the events drawn on the map each time they are loaded, or null when loading failed. */
  onEventsChange?: (features: MappedEventFeature[] | null) => void;
  /** Filled in once the map runs, so that other parts of the page can show an event on it. */
  control?: RefObject<UsageMapControl | null>;
};

export type UsageMapControl = {
  /** Flies to the event and opens its popup; false when the event is not on the map. */
  showEvent: (eventId: number) => boolean;
};

type EventCollection = { type: "FeatureCollection"; features: MappedEventFeature[] };
const EMPTY: EventCollection = { type: "FeatureCollection", features: [] };

async function fetchEvents(query: string): Promise<EventCollection> {
  const response = await fetch(`/api/map/events.geojson?${query}`, { headers: { Accept: "application/geo+json" } });
  if (!response.ok) throw new Error(`events: status ${response.status}`);
  return (await response.json()) as EventCollection;
}

function text(tag: string, content: string, className?: string) {
  const element = document.createElement(tag);
  element.textContent = content;
  if (className) element.className = className;
  return element;
}

const gal = (value: unknown) => `${Number(value ?? 0).toLocaleString("en-US", { maximumFractionDigits: 2 })} gal`;

/** The popup for one event, built from DOM nodes (never from HTML strings). */
function popupContent(properties: Record<string, unknown>, timeZone: string): HTMLElement {
  const box = document.createElement("div");
  box.className = "space-y-1 font-sans text-sm text-ink";
  box.append(
    text(
      "p",
      `${properties.number} · ${EVENT_KIND_LABELS[properties.kind as EventKind] ?? properties.kind}`,
      "font-semibold",
    ),
  );
  const when = properties.startedAt
    ? new Date(String(properties.startedAt)).toLocaleString("en-US", {
        timeZone,
        dateStyle: "medium",
        timeStyle: "short",
      })
    : "time not given";
  box.append(text("p", `${when}${properties.station ? ` · ${properties.station}` : ""}`));
  if (properties.address) box.append(text("p", String(properties.address)));
  const list = document.createElement("dl");
  list.className = "grid grid-cols-2 gap-x-3";
  const row = (label: string, value: string) => list.append(text("dt", label, "text-slate-ft"), text("dd", value));
  row("Foam class", eventFoamClassesLabel(properties.foamClass as EventFoamClasses));
  row("Concentrate", gal(properties.concentrateGal));
  row("Foam solution", gal(properties.solutionGal));
  row("Water", gal(properties.waterGal));
  if (properties.drainageBasin) row("Drainage basin", String(properties.drainageBasin));
  if (properties.nearestWaterway && properties.nearestWaterwayM != null) {
    row("Nearest water", `${properties.nearestWaterway}, ${Math.round(Number(properties.nearestWaterwayM))} m`);
  }
  box.append(list);
  if (properties.pfasContaining === true) {
    box.append(
      text("p", "PFAS-containing foam used: check release reporting duties.", "font-semibold text-danger-700"),
    );
  }
  const link = text("a", "Open the event report", "font-semibold text-pond-700 underline");
  link.setAttribute("href", `/events/${Number(properties.id)}`);
  box.append(link);
  return box;
}

/** The chief's usage map: events as circles, clusters at low zoom, popups, overlay layers. */
export function UsageMap({ eventsQuery, timeZone, overlays, onViewChange, onEventsChange, control }: Props) {
  const container = useRef<HTMLDivElement>(null);
  const mapRef = useRef<MapLibreMap | null>(null);
  const [state, setState] = useState<"loading" | "ready" | "failed">("loading");
  const [eventsFailed, setEventsFailed] = useState(false);
  const viewChange = useRef(onViewChange);
  viewChange.current = onViewChange;
  const eventsChange = useRef(onEventsChange);
  eventsChange.current = onEventsChange;
  const loaded = useRef<EventCollection>(EMPTY);
  const loadedQuery = useRef<string | null>(null);
  const currentQuery = useRef(eventsQuery);
  currentQuery.current = eventsQuery;
  const initial = useRef({ overlays });
  const zone = useRef(timeZone);
  zone.current = timeZone;

  useEffect(() => {
    let cancelled = false;
    let map: MapLibreMap | undefined;
    loadMapLibre()
      .then((maplibre) => {
        if (cancelled || !container.current) return;
        map = new maplibre.Map({
          container: container.current,
          style: basemapStyle(window.location.origin),
          bounds: DISTRICT_BOUNDS,
          fitBoundsOptions: { padding: 16 },
          minZoom: 3,
          maxZoom: 18,
          attributionControl: { compact: true },
          canvasContextAttributes: { preserveDrawingBuffer: true },
        });
        mapRef.current = map;
        map.addControl(new maplibre.NavigationControl({ showCompass: false }), "top-right");
        map.addControl(new maplibre.ScaleControl({ unit: "imperial" }), "bottom-left");
        const report = () => {
          const bounds = map!.getBounds();
          viewChange.current([bounds.getWest(), bounds.getSouth(), bounds.getEast(), bounds.getNorth()]);
        };
        map.on("load", () => {
          if (!map) return;
          const { overlays: shown } = initial.current;
          addOverlays(map, shown);
          map.addSource("events", {
            type: "geojson",
            data: EMPTY,
            cluster: true,
            clusterMaxZoom: 11,
            clusterRadius: 36,
            clusterProperties: {
              concentrate: ["+", ["get", "concentrateGal"]],
              pfas: ["max", ["case", ["==", ["get", "pfasContaining"], true], 1, 0]],
            },
          });
          addEventLayers(map);
          let popup: InstanceType<typeof maplibre.Popup> | null = null;
          const openPopup = (coordinates: [number, number], properties: Record<string, unknown>) => {
            popup?.remove();
            popup = new maplibre.Popup({ maxWidth: "280px" })
              .setLngLat(coordinates)
              .setDOMContent(popupContent(properties, zone.current))
              .addTo(map!);
          };
          map.on("click", "event-circles", (event: MapLayerMouseEvent) => {
            const feature = event.features?.[0];
            if (!feature || feature.geometry.type !== "Point") return;
            openPopup(feature.geometry.coordinates as [number, number], feature.properties ?? {});
          });
          if (control) {
            control.current = {
              showEvent(eventId) {
                const feature = loaded.current.features.find((candidate) => candidate.properties.id === eventId);
                if (!map || !feature) return false;
                const coordinates = feature.geometry.coordinates;
                // Past the clustering zoom, so the event is drawn as its own circle.
                map.flyTo({ center: coordinates, zoom: Math.max(map.getZoom(), 13), essential: true });
                openPopup(coordinates, feature.properties);
                return true;
              },
            };
          }
          void loadEvents(map, currentQuery.current);
          map.on("click", "event-clusters", async (event: MapLayerMouseEvent) => {
            const feature = event.features?.[0];
            if (!feature || feature.geometry.type !== "Point") return;
            const source = map!.getSource("events") as GeoJSONSource;
            const zoom = await source.getClusterExpansionZoom(Number(feature.properties?.cluster_id));
            map!.easeTo({ center: feature.geometry.coordinates as [number, number], zoom });
          });
          for (const layer of ["event-circles", "event-clusters"]) {
            map.on("mouseenter", layer, () => (map!.getCanvas().style.cursor = "pointer"));
            map.on("mouseleave", layer, () => (map!.getCanvas().style.cursor = ""));
          }
          map.once("idle", () => {
            if (!cancelled) setState("ready");
          });
          // How many event circles and groups are drawn now (read by people's tools and the tests).
          map.on("idle", () => {
            if (!map || !container.current) return;
            const drawn = map.queryRenderedFeatures({ layers: ["event-circles", "event-clusters"] });
            container.current.dataset.markers = String(drawn.length);
          });
          report();
        });
        map.on("moveend", report);
        map.on("error", (event) => {
          // A failed tile or layer request leaves the rest of the map working; say so once.
          console.warn("map:", event.error?.message);
        });
      })
      .catch(() => {
        if (!cancelled) setState("failed");
      });
    return () => {
      cancelled = true;
      map?.remove();
      mapRef.current = null;
      if (control) control.current = null;
    };
    // The map is made once; later changes reach it through refs and the effects below.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  /** Loads the events for a filter, draws them and hands them to the page; the newest request wins. */
  async function loadEvents(map: MapLibreMap, query: string) {
    loadedQuery.current = query;
    try {
      const collection = await fetchEvents(query);
      if (loadedQuery.current !== query || mapRef.current !== map) return;
      loaded.current = collection;
      (map.getSource("events") as GeoJSONSource | undefined)?.setData(
        collection as unknown as Parameters<GeoJSONSource["setData"]>[0],
      );
      setEventsFailed(false);
      eventsChange.current?.(collection.features);
    } catch {
      if (loadedQuery.current !== query) return;
      setEventsFailed(true);
      eventsChange.current?.(null);
    }
  }

  useEffect(() => {
    const map = mapRef.current;
    if (map?.getSource("events") && loadedQuery.current !== eventsQuery) void loadEvents(map, eventsQuery);
  }, [eventsQuery]);

  useEffect(() => {
    const map = mapRef.current;
    if (!map?.isStyleLoaded()) return;
    for (const [overlay, layers] of Object.entries(OVERLAY_LAYERS) as [OverlayId, string[]][]) {
      for (const layer of layers) {
        if (map.getLayer(layer)) map.setLayoutProperty(layer, "visibility", overlays[overlay] ? "visible" : "none");
      }
    }
  }, [overlays]);

  return (
    <div className="relative h-[32rem] w-full overflow-hidden rounded-lg border border-stone-300 lg:h-[40rem]">
      <div
        ref={container}
        className="h-full w-full"
        role="region"
        aria-label="Usage map"
        data-testid="usage-map"
        data-state={state}
      />
      {state === "failed" ? (
        <p className="absolute inset-x-4 top-4 caution" role="alert">
          The map could not start in this browser (WebGL is needed). The totals and charts beside it still work.
        </p>
      ) : null}
      {eventsFailed ? (
        <p className="absolute inset-x-4 bottom-10 caution" role="alert">
          The events could not be loaded just now. Reload the page to try again.
        </p>
      ) : null}
    </div>
  );
}

function addOverlays(map: MapLibreMap, shown: Record<OverlayId, boolean>) {
  const origin = window.location.origin;
  const visibility = (overlay: OverlayId) => (shown[overlay] ? "visible" : "none") as "visible" | "none";
  map.addSource("basins", { type: "geojson", data: `${origin}/api/geo/layers/drainage_basins` });
  map.addSource("waterways", { type: "geojson", data: `${origin}/api/geo/layers/waterways` });
  map.addSource("buffer", { type: "geojson", data: `${origin}/api/geo/layers/waterway_buffer` });
  map.addSource("inlets", { type: "geojson", data: `${origin}/api/geo/layers/storm_inlets` });
  map.addSource("basin-labels", { type: "geojson", data: `${origin}/api/geo/layers/drainage_basins?as=labels` });
  map.addLayer({
    id: "overlay-basins-fill",
    type: "fill",
    source: "basins",
    layout: { visibility: visibility("basins") },
    paint: { "fill-color": MAP_COLOURS.basin, "fill-opacity": 0.06 },
  });
  map.addLayer({
    id: "overlay-basins-line",
    type: "line",
    source: "basins",
    layout: { visibility: visibility("basins") },
    paint: { "line-color": MAP_COLOURS.basin, "line-width": 2, "line-dasharray": [2, 2] },
  });
  map.addLayer({
    id: "overlay-buffer",
    type: "fill",
    source: "buffer",
    layout: { visibility: visibility("buffer") },
    paint: { "fill-color": "#2b7fa3", "fill-opacity": 0.22 },
  });
  map.addLayer({
    id: "overlay-waterways-fill",
    type: "fill",
    source: "waterways",
    filter: ["==", ["geometry-type"], "Polygon"],
    layout: { visibility: visibility("waterways") },
    paint: { "fill-color": "#2b7fa3", "fill-opacity": 0.5 },
  });
  map.addLayer({
    id: "overlay-waterways-line",
    type: "line",
    source: "waterways",
    layout: { visibility: visibility("waterways") },
    paint: { "line-color": "#1f5f80", "line-width": 2.5 },
  });
  map.addLayer({
    id: "overlay-inlets",
    type: "circle",
    source: "inlets",
    minzoom: 12,
    layout: { visibility: visibility("inlets") },
    paint: {
      "circle-radius": 3.5,
      "circle-color": "#ffffff",
      "circle-stroke-color": MAP_COLOURS.inlet,
      "circle-stroke-width": 2,
    },
  });
  map.addLayer({
    id: "overlay-basins-label",
    type: "symbol",
    source: "basin-labels",
    layout: {
      visibility: visibility("basins"),
      "text-field": ["concat", ["get", "name"], " basin"],
      "text-font": ["Public Sans"],
      "text-size": 13,
    },
    paint: { "text-color": MAP_COLOURS.basin, "text-halo-color": "#ffffff", "text-halo-width": 2 },
  });
}

function addEventLayers(map: MapLibreMap) {
  const sqrtConcentrate: ExpressionSpecification = ["sqrt", ["max", 0, ["get", "concentrateGal"]]];
  map.addLayer({
    id: "event-clusters",
    type: "circle",
    source: "events",
    filter: ["has", "point_count"],
    paint: {
      "circle-color": "#1b2430",
      "circle-opacity": 0.78,
      "circle-radius": ["interpolate", ["linear"], ["sqrt", ["get", "concentrate"]], 0, 12, 30, 30],
      "circle-stroke-color": ["case", ["==", ["get", "pfas"], 1], PFAS_RING, "#ffffff"],
      "circle-stroke-width": ["case", ["==", ["get", "pfas"], 1], 4, 2],
    },
  });
  map.addLayer({
    id: "event-cluster-count",
    type: "symbol",
    source: "events",
    filter: ["has", "point_count"],
    layout: { "text-field": ["get", "point_count_abbreviated"], "text-font": ["Public Sans"], "text-size": 13 },
    paint: { "text-color": "#ffffff" },
  });
  map.addLayer({
    id: "event-pfas-ring",
    type: "circle",
    source: "events",
    filter: ["all", ["!", ["has", "point_count"]], ["==", ["get", "pfasContaining"], true]],
    paint: {
      "circle-radius": ["+", ["interpolate", ["linear"], sqrtConcentrate, 0, 5, 10, 22], 5],
      "circle-color": "rgba(0,0,0,0)",
      "circle-stroke-color": PFAS_RING,
      "circle-stroke-width": 3,
    },
  });
  map.addLayer({
    id: "event-circles",
    type: "circle",
    source: "events",
    filter: ["!", ["has", "point_count"]],
    paint: {
      // Area grows with concentrate: 1 gal ≈ 7 px radius, 100 gal = 22 px.
      "circle-radius": ["interpolate", ["linear"], sqrtConcentrate, 0, 5, 10, 22],
      "circle-color": [
        "match",
        ["get", "foamClass"],
        "A",
        FOAM_CLASS_COLOURS.A,
        "B",
        FOAM_CLASS_COLOURS.B,
        "A+B",
        FOAM_CLASS_COLOURS["A+B"],
        FOAM_CLASS_COLOURS.none,
      ],
      "circle-opacity": 0.8,
      "circle-stroke-color": "#ffffff",
      "circle-stroke-width": 1.5,
    },
  });
}
