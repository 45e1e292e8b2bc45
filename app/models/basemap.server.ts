import { readFile } from "node:fs/promises";
import path from "node:path";
import { TILE_MAX_ZOOM } from "~/lib/geo/map-style";

const TILE_DIRECTORY = path.resolve(process.env.TILES_DIR ?? "tiles/basemap");

export type TileAddress = { z: number; x: number; y: number };

/** Parses z/x/y.pbf; null when it is not a tile address of this basemap. */
export function parseTileAddress(z: string, x: string, file: string): TileAddress | null {
  const match = /^(\d{1,6})\.pbf$/.exec(file);
  if (!match || !/^\d{1,2}$/.test(z) || !/^\d{1,6}$/.test(x)) return null;
  const address = { z: Number(z), x: Number(x), y: Number(match[1]) };
  const n = 2 ** address.z;
  if (address.z > TILE_MAX_ZOOM || address.x >= n || address.y >= n) return null;
  return address;
}

/** The tile's bytes, or an empty buffer for a valid address with nothing on it (sea, far away). */
export async function readTile({ z, x, y }: TileAddress): Promise<Uint8Array> {
  try {
    return await readFile(path.join(TILE_DIRECTORY, String(z), String(x), `${y}.pbf`));
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") return new Uint8Array(0);
    throw error;
  }
}
