import { gunzipSync } from "node:zlib";
import type { Route } from "./+types/api.map.events";
import { requireCapability } from "~/lib/access.server";
import { parseMapFilters } from "~/lib/geo/map-filters";
import { apiError } from "~/lib/http.server";
import { mapEventsBody, mapReadState } from "~/models/usage-map.server";

/** GET /api/map/events.geojson?from=&to=&bbox=&class=&kind=&station= — filed events with their totals. */
export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "usage.map");
  const { versions, timeZone } = await mapReadState(request);
  const parsed = parseMapFilters(new URL(request.url).searchParams, timeZone);
  if (!parsed.ok) apiError(400, parsed.message, { errors: { [parsed.field]: [parsed.message] } });
  const body = await mapEventsBody(parsed.filters, versions);
  // The browser keeps its copy and asks again each time; an unchanged answer is a bodiless 304.
  const headers = new Headers({ "Cache-Control": "private, no-cache", Vary: "Accept-Encoding, Cookie, Authorization" });
  if (body.etag) headers.set("ETag", body.etag);
  if (body.etag && matchesTag(request.headers.get("If-None-Match"), body.etag)) {
    return new Response(null, { status: 304, headers });
  }
  headers.set("Content-Type", "application/geo+json; charset=utf-8");
  if (/\bgzip\b/.test(request.headers.get("Accept-Encoding") ?? "")) {
    headers.set("Content-Encoding", "gzip");
    headers.set("Content-Length", String(body.gzipped.byteLength));
    return new Response(new Uint8Array(body.gzipped), { headers });
  }
  const plain = gunzipSync(body.gzipped);
  headers.set("Content-Length", String(plain.byteLength));
  return new Response(new Uint8Array(plain), { headers });
}

function matchesTag(header: string | null, etag: string): boolean {
  if (!header) return false;
  return header.split(",").some((candidate) => {
    const tag = candidate.trim().replace(/^W\//, "");
    return tag === etag || tag === "*";
  });
}
