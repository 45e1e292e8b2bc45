import type { Route } from "./+types/tiles";
import { requireUser } from "~/lib/auth.server";
import { httpError } from "~/lib/http.server";
import { parseTileAddress, readTile } from "~/models/basemap.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  await requireUser(request);
  const address = parseTileAddress(params.z, params.x, params.file);
  if (!address) httpError(404, "No such map tile.");
  const body = await readTile(address);
  return new Response(body.length ? Buffer.from(body) : null, {
    status: 200,
    headers: {
      "Content-Type": "application/x-protobuf",
      "Content-Length": String(body.length),
      // Tiles change only when the basemap is rebuilt and redeployed.
      "Cache-Control": "private, max-age=86400, stale-while-revalidate=604800",
    },
  });
}
