import type { StyleSpecification } from "maplibre-gl";

/** Where the demo district sits; the maps open here. Demo data: Alder Bend (invented). */
export const DISTRICT_CENTER: [number, number] = [-98.2, 38.7];
export const DISTRICT_BOUNDS: [number, number, number, number] = [-98.32, 38.6, -98.08, 38.8];
export const TILE_MAX_ZOOM = 14;

/** Labels are drawn in the browser with the page's own font: the style has no glyphs URL. */
const FONT = ["Public Sans"];

export const MAP_COLOURS = {
  paper: "#f4f1ea",
  land: "#ebe5d5",
  district: "#faf7ef",
  districtEdge: "#8f3d12",
  water: "#4f8ea6",
  waterFill: "#a8cad6",
  road: "#ffffff",
  roadCasing: "#b9b2a2",
  county: "#b4ab98",
  state: "#7d7464",
  text: "#1b2430",
  halo: "#faf7ef",
  basin: "#17565f",
  station: "#8f3d12",
  inlet: "#3d4a5c",
};

/** The credit of the low-zoom layers: land, states and counties from the us-atlas package. */
export const CENSUS_CREDIT = "US Census Bureau cartographic boundaries (public domain)";
/** The credit of the district's own layers (in the demo, invented). */
export const DISTRICT_CREDIT = "Alder Bend district: demo data, invented";
// The district layers start at the zooms their tiles carry them from (scripts/build-tiles.ts), so
// the district is credited only once it is drawn.
/** The Census layers are drawn below this zoom; above it the district's own layers stand alone. */
export const CENSUS_MAX_ZOOM = 10;

/** The basemap style of the app's own tiles (tiles/basemap, served from /tiles/{z}/{x}/{y}.pbf). */
export function basemapStyle(origin: string): StyleSpecification {
  const c = MAP_COLOURS;
  const label = (size: number) => ({
    "text-font": FONT,
    "text-size": size,
  });
  return {
    version: 8,
    name: "Foamtally basemap",
    // One tile set, two sources: each source's credit shows only while one of its layers is drawn
    // (MapLibre credits the sources in use at the current zoom), so the Census Bureau is credited
    // for the country, states and counties, and never over the invented district alone.
    sources: {
      census: {
        type: "vector",
        tiles: [`${origin}/tiles/{z}/{x}/{y}.pbf`],
        minzoom: 0,
        maxzoom: TILE_MAX_ZOOM,
        attribution: CENSUS_CREDIT,
      },
      district: {
        type: "vector",
        tiles: [`${origin}/tiles/{z}/{x}/{y}.pbf`],
        minzoom: 0,
        maxzoom: TILE_MAX_ZOOM,
        attribution: DISTRICT_CREDIT,
      },
    },
    layers: [
      {
        id: "paper",
        type: "background",
        // Past the Census layers' zooms the ground is drawn as land.
        paint: { "background-color": ["step", ["zoom"], "#dfe7e8", CENSUS_MAX_ZOOM, c.land] },
      },
      {
        id: "land",
        type: "fill",
        source: "census",
        "source-layer": "land",
        maxzoom: CENSUS_MAX_ZOOM,
        paint: { "fill-color": c.land },
      },
      {
        id: "district-fill",
        type: "fill",
        source: "district",
        "source-layer": "district",
        minzoom: 6,
        paint: { "fill-color": c.district },
      },
      {
        id: "county-lines",
        type: "line",
        source: "census",
        maxzoom: CENSUS_MAX_ZOOM,
        "source-layer": "county_lines",
        paint: { "line-color": c.county, "line-width": 0.8, "line-dasharray": [3, 2] },
      },
      {
        id: "state-lines",
        type: "line",
        source: "census",
        maxzoom: CENSUS_MAX_ZOOM,
        "source-layer": "state_lines",
        paint: { "line-color": c.state, "line-width": ["interpolate", ["linear"], ["zoom"], 3, 0.8, 10, 2] },
      },
      {
        id: "water-fill",
        type: "fill",
        source: "district",
        "source-layer": "water",
        minzoom: 9,
        filter: ["==", ["geometry-type"], "Polygon"],
        paint: { "fill-color": c.waterFill, "fill-outline-color": c.water },
      },
      {
        id: "water-lines",
        type: "line",
        source: "district",
        "source-layer": "water",
        minzoom: 9,
        filter: ["==", ["geometry-type"], "LineString"],
        paint: { "line-color": c.water, "line-width": ["interpolate", ["linear"], ["zoom"], 9, 1, 16, 4] },
      },
      {
        id: "road-casing",
        type: "line",
        source: "district",
        "source-layer": "roads",
        minzoom: 11,
        layout: { "line-cap": "round", "line-join": "round" },
        paint: { "line-color": c.roadCasing, "line-width": ["interpolate", ["linear"], ["zoom"], 11, 1.5, 16, 10] },
      },
      {
        id: "roads",
        type: "line",
        source: "district",
        "source-layer": "roads",
        minzoom: 11,
        layout: { "line-cap": "round", "line-join": "round" },
        paint: { "line-color": c.road, "line-width": ["interpolate", ["linear"], ["zoom"], 11, 0.6, 16, 8] },
      },
      {
        id: "district-edge",
        type: "line",
        source: "district",
        "source-layer": "district",
        minzoom: 6,
        paint: { "line-color": c.districtEdge, "line-width": 2, "line-dasharray": [4, 2] },
      },
      {
        id: "stations",
        type: "circle",
        source: "district",
        "source-layer": "stations",
        minzoom: 10,
        paint: {
          "circle-radius": 5,
          "circle-color": c.station,
          "circle-stroke-color": "#ffffff",
          "circle-stroke-width": 2,
        },
      },
      {
        id: "state-labels",
        type: "symbol",
        source: "census",
        "source-layer": "state_labels",
        maxzoom: 8,
        layout: { ...label(13), "text-field": ["get", "name"], "text-transform": "uppercase" },
        paint: { "text-color": c.state, "text-halo-color": c.halo, "text-halo-width": 1.5 },
      },
      {
        id: "county-labels",
        type: "symbol",
        source: "census",
        "source-layer": "county_labels",
        // Real county names give way to the district's own features at street zooms.
        maxzoom: 9.5,
        layout: { ...label(12), "text-field": ["get", "name"] },
        paint: { "text-color": c.state, "text-halo-color": c.halo, "text-halo-width": 1.5 },
      },
      {
        id: "road-labels",
        type: "symbol",
        source: "district",
        "source-layer": "roads",
        minzoom: 14,
        layout: { ...label(12), "text-field": ["get", "name"], "symbol-placement": "line" },
        paint: { "text-color": c.text, "text-halo-color": "#ffffff", "text-halo-width": 1.5 },
      },
      {
        id: "water-labels",
        type: "symbol",
        source: "district",
        "source-layer": "water",
        minzoom: 12,
        filter: ["==", ["geometry-type"], "LineString"],
        layout: { ...label(12), "text-field": ["get", "name"], "symbol-placement": "line" },
        paint: { "text-color": "#1f5566", "text-halo-color": c.halo, "text-halo-width": 1.5 },
      },
      {
        id: "pond-labels",
        type: "symbol",
        source: "district",
        "source-layer": "water",
        minzoom: 13,
        filter: ["==", ["geometry-type"], "Polygon"],
        layout: { ...label(12), "text-field": ["get", "name"] },
        paint: { "text-color": "#1f5566", "text-halo-color": c.halo, "text-halo-width": 1.5 },
      },
      {
        id: "station-labels",
        type: "symbol",
        source: "district",
        "source-layer": "stations",
        minzoom: 11,
        layout: {
          ...label(13),
          "text-field": ["concat", ["get", "code"], " ", ["get", "name"]],
          "text-offset": [0, 1.2],
          "text-anchor": "top",
        },
        paint: { "text-color": c.station, "text-halo-color": c.halo, "text-halo-width": 2 },
      },
    ],
  };
}
