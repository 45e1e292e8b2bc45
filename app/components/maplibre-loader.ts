import "maplibre-gl/dist/maplibre-gl.css";
import workerUrl from "maplibre-gl/dist/maplibre-gl-worker.mjs?url";

/**
 * MapLibre GL JS, loaded in the browser only (call it inside an effect). The worker comes from the
 * app's own assets; tiles, style and data come from the app's own routes — no other host.
 */
export async function loadMapLibre() {
  const maplibre = await import("maplibre-gl");
  if (maplibre.getWorkerUrl() !== workerUrl) maplibre.setWorkerUrl(workerUrl);
  return maplibre;
}

export type MapLibre = Awaited<ReturnType<typeof loadMapLibre>>;
