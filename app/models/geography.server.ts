import { randomUUID } from "node:crypto";
import type { FeatureCollection } from "geojson";
import type { Knex } from "knex";
import { recordAudit } from "~/lib/audit.server";
import { decimalOrNull } from "~/lib/decimal";
import { db, type Db } from "~/lib/db.server";
import { searchAddresses, type AddressMatch } from "~/lib/geo/addresses";
import {
  checkLocation,
  DEFAULT_WATERWAY_BUFFER_M,
  isValidLatLon,
  labelPoints,
  waterwayBufferArea,
  type GeographyChecks,
  type GeographyLayers,
  type LocationCheck,
} from "~/lib/geo/checks";
import { LAYER_KINDS, LAYER_RULES, validateLayer, type LayerKind } from "~/lib/geo/layers";
import { deleteObjectQuietly, putObject } from "~/lib/storage.server";
import { readAgencySettings } from "./agency-settings.server";
import { describeFile, recordNewVersion, type StoredFile } from "./file-versions.server";
import { bumpDataVersion } from "./data-version.server";

type Actor = { id: number; email: string } | null;

// Parsed layers, keyed by kind; a row's version changes on every replacement. Only reads through
// the app's own connection use it (not a transaction, whose upload may still roll back, nor a
// seed's or test's connection to another database).
const cache = new Map<LayerKind, { version: number; collection: FeatureCollection }>();

async function layerCollections(kinds: readonly LayerKind[], connection: Db = db) {
  const cacheable = connection === db;
  const rows: { kind: LayerKind; version: number }[] = await connection("geo_layers")
    .whereIn("kind", kinds)
    .select("kind", "version");
  const result = new Map<LayerKind, FeatureCollection>();
  const stale = rows.filter((row) => !cacheable || cache.get(row.kind)?.version !== row.version);
  const fresh: { kind: string; geojson: string }[] = stale.length
    ? await connection("geo_layers")
        .whereIn(
          "kind",
          stale.map((row) => row.kind),
        )
        .select("kind", "geojson")
    : [];
  for (const row of rows) {
    const loaded = fresh.find((candidate) => candidate.kind === row.kind);
    const collection: FeatureCollection = loaded ? JSON.parse(loaded.geojson) : cache.get(row.kind)!.collection;
    if (loaded && cacheable) cache.set(row.kind, { version: row.version, collection });
    result.set(row.kind, collection);
  }
  return result;
}

export async function loadGeographyLayers(connection: Db = db): Promise<GeographyLayers> {
  const found = await layerCollections(["drainage_basins", "waterways", "storm_inlets", "jurisdiction"], connection);
  return {
    drainageBasins: found.get("drainage_basins") ?? null,
    waterways: found.get("waterways") ?? null,
    stormInlets: found.get("storm_inlets") ?? null,
    jurisdiction: found.get("jurisdiction") ?? null,
  };
}

/** The agency's waterway buffer in metres (300 ft by default; local rules govern). */
export async function waterwayBufferMetres(connection: Db = db): Promise<number> {
  const { waterwayBufferM } = await readAgencySettings(connection);
  return waterwayBufferM > 0 ? waterwayBufferM : DEFAULT_WATERWAY_BUFFER_M;
}

/** The checks for a point that is not (yet) saved — what the form shows as soon as a point is set. */
export async function checkPoint(latitude: number, longitude: number, connection: Db = db): Promise<LocationCheck> {
  const [layers, waterwayBufferM] = await Promise.all([
    loadGeographyLayers(connection),
    waterwayBufferMetres(connection),
  ]);
  const missing: LayerKind[] = [];
  if (!layers.drainageBasins) missing.push("drainage_basins");
  if (!layers.waterways) missing.push("waterways");
  if (!layers.stormInlets) missing.push("storm_inlets");
  if (!layers.jurisdiction) missing.push("jurisdiction");
  return {
    ...checkLocation({ latitude, longitude }, layers, waterwayBufferM),
    waterwayBufferM,
    layersMissing: missing,
  };
}

const NO_CHECKS: GeographyChecks = {
  drainageBasin: null,
  nearestWaterway: null,
  nearestWaterwayM: null,
  nearestInlet: null,
  nearestInletM: null,
  withinWaterwayBuffer: null,
  outsideJurisdiction: null,
};

function checkColumns(checks: GeographyChecks) {
  return {
    drainage_basin: checks.drainageBasin?.slice(0, 120) ?? null,
    nearest_waterway: checks.nearestWaterway?.slice(0, 120) ?? null,
    nearest_waterway_m: checks.nearestWaterwayM,
    nearest_inlet: checks.nearestInlet?.slice(0, 120) ?? null,
    nearest_inlet_m: checks.nearestInletM,
    within_waterway_buffer: checks.withinWaterwayBuffer,
    outside_jurisdiction: checks.outsideJurisdiction,
  };
}

/** The stored checks of an event row, as the event page and the API show them. */
export function checksOfRow(row: Record<string, unknown>): GeographyChecks {
  const flag = (value: unknown) => (value == null ? null : Boolean(value));
  return {
    drainageBasin: (row.drainage_basin as string | null) ?? null,
    nearestWaterway: (row.nearest_waterway as string | null) ?? null,
    nearestWaterwayM: decimalOrNull(row.nearest_waterway_m),
    nearestInlet: (row.nearest_inlet as string | null) ?? null,
    nearestInletM: decimalOrNull(row.nearest_inlet_m),
    withinWaterwayBuffer: flag(row.within_waterway_buffer),
    outsideJurisdiction: flag(row.outside_jurisdiction),
  };
}

function locationOf(row: { latitude: unknown; longitude: unknown }) {
  const latitude = decimalOrNull(row.latitude);
  const longitude = decimalOrNull(row.longitude);
  if (latitude === null || longitude === null) return null;
  return isValidLatLon(latitude, longitude) ? { latitude, longitude } : null;
}

/**
 * Recomputes and stores the geography checks of one event from its saved latitude/longitude.
 * Call it inside the transaction that saves the event's location. An event without a location
 * gets empty checks. Returns the checks, or null when there is no such event.
 */
export async function recomputeEventGeography(eventId: number, trx: Db = db): Promise<GeographyChecks | null> {
  const event = await trx("events").where({ id: eventId }).first("id", "latitude", "longitude");
  if (!event) return null;
  const location = locationOf(event);
  const checks = location
    ? checkLocation(location, await loadGeographyLayers(trx), await waterwayBufferMetres(trx))
    : NO_CHECKS;
  await trx("events")
    .where({ id: eventId })
    .update({ ...checkColumns(checks), geo_checked_at: trx.fn.now() });
  await bumpDataVersion(trx, "reports");
  return checks;
}

const BATCH = 500;

/** Recomputes the stored checks of every event (after a layer or the buffer changes). */
export async function recomputeAllEventGeography(connection: Db = db): Promise<number> {
  const layers = await loadGeographyLayers(connection);
  const bufferM = await waterwayBufferMetres(connection);
  let lastId = 0;
  let count = 0;
  for (;;) {
    const rows: { id: number; latitude: unknown; longitude: unknown }[] = await connection("events")
      .where("id", ">", lastId)
      .orderBy("id")
      .limit(BATCH)
      .select("id", "latitude", "longitude");
    if (rows.length === 0) break;
    lastId = rows[rows.length - 1].id;
    count += rows.length;
    const values = rows.map((row) => {
      const location = locationOf(row);
      return { id: row.id, ...checkColumns(location ? checkLocation(location, layers, bufferM) : NO_CHECKS) };
    });
    // One UPDATE … JOIN per batch rather than one statement per event.
    const columns = Object.keys(values[0]) as (keyof (typeof values)[number])[];
    const select = values
      .map((_, index) => `SELECT ${columns.map((column) => (index === 0 ? `? AS \`${column}\`` : "?")).join(", ")}`)
      .join(" UNION ALL ");
    const bindings = values.flatMap((value) => columns.map((column) => value[column]));
    const assignments = columns
      .filter((column) => column !== "id")
      .map((column) => `e.\`${column}\` = v.\`${column}\``)
      .join(", ");
    await connection.raw(
      `UPDATE events e JOIN (${select}) v ON v.id = e.id SET ${assignments}, e.geo_checked_at = CURRENT_TIMESTAMP`,
      bindings,
    );
  }
  await bumpDataVersion(connection, "reports");
  return count;
}

export type LayerSummary = {
  kind: LayerKind;
  label: string;
  help: string;
  fileName: string | null;
  featureCount: number | null;
  byteSize: number | null;
  uploadedAt: string | null;
  uploadedBy: string | null;
};

export async function listLayers(): Promise<LayerSummary[]> {
  const rows = await db("geo_layers")
    .leftJoin("users", "users.id", "geo_layers.uploaded_by")
    .select(
      "geo_layers.kind",
      "geo_layers.file_name",
      "geo_layers.feature_count",
      "geo_layers.byte_size",
      "geo_layers.uploaded_at",
      "users.name as uploader",
    );
  return LAYER_KINDS.map((kind) => {
    const row = rows.find((candidate) => candidate.kind === kind);
    return {
      kind,
      label: LAYER_RULES[kind].label,
      help: LAYER_RULES[kind].help,
      fileName: row?.file_name ?? null,
      featureCount: row ? Number(row.feature_count) : null,
      byteSize: row ? Number(row.byte_size) : null,
      uploadedAt: row ? new Date(row.uploaded_at).toISOString() : null,
      uploadedBy: row ? (row.uploader ?? "demo seed") : null,
    };
  });
}

/** The stored GeoJSON of one layer (as text), or null when none was uploaded. */
export async function layerText(kind: LayerKind): Promise<string | null> {
  const row = await db("geo_layers").where({ kind }).first("geojson");
  return row?.geojson ?? null;
}

/** One point inside each feature, carrying its name: where the map writes the label. */
export async function layerLabelPoints(kind: LayerKind): Promise<FeatureCollection> {
  const found = await layerCollections([kind]);
  return labelPoints(found.get(kind) ?? null);
}

export async function waterwayBufferGeoJSON(): Promise<{ bufferM: number; collection: FeatureCollection }> {
  const [layers, bufferM] = await Promise.all([loadGeographyLayers(), waterwayBufferMetres()]);
  return { bufferM, collection: waterwayBufferArea(layers.waterways, bufferM) };
}

export async function findAddresses(query: string, limit = 8): Promise<AddressMatch[]> {
  const found = await layerCollections(["address_points"]);
  return searchAddresses(found.get("address_points") ?? null, query, limit);
}

export type ReplaceLayerResult =
  { ok: true; featureCount: number; eventsRechecked: number } | { ok: false; errors: string[] };

/**
 * Replaces one layer with an uploaded GeoJSON file. Nothing changes unless the whole file is
 * valid; then the layer, the stored checks of every event and the audit row change together.
 */
export async function replaceLayer(
  input: { kind: LayerKind; text: string; fileName: string },
  actor: Actor,
  clientAddress: string | null = null,
  {
    connection = db,
    recheckEvents = true,
    keepFile = true,
  }: { connection?: Knex; recheckEvents?: boolean; keepFile?: boolean } = {},
): Promise<ReplaceLayerResult> {
  const validation = validateLayer(input.kind, input.text);
  if (!validation.ok) return validation;
  const geojson = JSON.stringify(validation.collection);
  // The uploaded file is kept as sent, under a key of its own, before the database changes.
  const uploaded = keepFile ? await storeLayerFile(input.kind, input.fileName, input.text) : null;
  const stored: string[] = uploaded ? [uploaded.key] : [];
  try {
    return await replaceLayerRows(input, actor, clientAddress, {
      connection,
      recheckEvents,
      geojson,
      validation,
      uploaded,
      stored,
    });
  } catch (error) {
    for (const key of stored) await deleteObjectQuietly(key);
    throw error;
  }
}

async function storeLayerFile(kind: LayerKind, fileName: string, text: string): Promise<StoredFile> {
  const body = new TextEncoder().encode(text);
  const file = describeFile(`geo-layers/${kind}/${randomUUID()}.geojson`, fileName, "application/geo+json", body);
  await putObject(file.key, body, file.contentType);
  return file;
}

async function replaceLayerRows(
  input: { kind: LayerKind; text: string; fileName: string },
  actor: Actor,
  clientAddress: string | null,
  options: {
    connection: Knex;
    recheckEvents: boolean;
    geojson: string;
    validation: { featureCount: number };
    uploaded: StoredFile | null;
    stored: string[];
  },
): Promise<ReplaceLayerResult> {
  const { connection, recheckEvents, geojson, validation, uploaded, stored } = options;
  const eventsRechecked = await connection.transaction(async (trx) => {
    const before = await trx("geo_layers")
      .where({ kind: input.kind })
      .forUpdate()
      .first("id", "version", "feature_count", "file_name", "geojson");
    const replacedFile = uploaded
      ? await recordNewVersion("geo_layer", input.kind, uploaded, actor?.id ?? null, trx, async () => {
          // A layer loaded before versions were kept: its text goes to the file store now, so it is kept too.
          if (!before) return null;
          const earlier = await storeLayerFile(input.kind, before.file_name || `${input.kind}.geojson`, before.geojson);
          stored.push(earlier.key);
          return earlier;
        })
      : null;
    const row = {
      file_name: input.fileName.slice(0, 255),
      geojson,
      feature_count: validation.featureCount,
      byte_size: Buffer.byteLength(geojson),
      uploaded_by: actor?.id ?? null,
      uploaded_at: trx.fn.now(),
    };
    if (before) {
      await trx("geo_layers")
        .where({ id: before.id })
        .update({ ...row, version: before.version + 1 });
    } else {
      await trx("geo_layers").insert({ kind: input.kind, ...row, version: 1 });
    }
    const rechecked = input.kind === "address_points" || !recheckEvents ? 0 : await recomputeAllEventGeography(trx);
    await recordAudit(
      {
        actorUserId: actor?.id ?? null,
        actorLabel: actor?.email ?? "demo seed",
        action: "geo_layer_replaced",
        entityType: "geo_layer",
        entityId: input.kind,
        summary: `${LAYER_RULES[input.kind].label}: ${validation.featureCount} feature${validation.featureCount === 1 ? "" : "s"} from ${input.fileName}; ${rechecked} event${rechecked === 1 ? "" : "s"} rechecked`,
        before: before ? { fileName: before.file_name, featureCount: before.feature_count, file: replacedFile } : null,
        after: { fileName: input.fileName, featureCount: validation.featureCount, file: uploaded },
        clientAddress,
      },
      trx,
    );
    return rechecked;
  });
  return { ok: true, featureCount: validation.featureCount, eventsRechecked };
}
