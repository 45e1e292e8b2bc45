// vt-pbf ships without types; only what scripts/build-tiles.ts uses.
declare module "vt-pbf" {
  import type { LegacyTile } from "geojson-vt";
  const vtpbf: {
    fromGeojsonVt(layers: Record<string, LegacyTile>, options?: { version?: number; extent?: number }): Uint8Array;
  };
  export default vtpbf;
}
