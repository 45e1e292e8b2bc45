import type { Knex } from "knex";
import { recordAudit } from "~/lib/audit.server";
import { conflict, RefusalError, refused, type Refusal } from "~/lib/refusal";
import type { SessionUser } from "~/lib/auth.server";
import { decimalOrNull } from "~/lib/decimal";
import { db, type Db } from "~/lib/db.server";
import {
  DischargeLineSchema,
  DispositionLineSchema,
  lineMinutes,
  TankReadingLineSchema,
  type DischargeLine,
  type FiledReport,
} from "~/lib/foam/report-schema";
import { boundedDraft } from "~/lib/foam/report-draft.server";
import { computeUsage, type DischargeInput, type TankReading, type UsageResult } from "~/lib/foam/totals";
import { changeCapabilityFor, changeReasonFor, decide } from "~/lib/access";
import {
  DEFAULT_INCIDENT_TYPE,
  EVENT_KINDS,
  INCIDENT_TYPES,
  type EventKind,
  type EventStatus,
  type IncidentType,
} from "~/lib/foam/vocabulary";
import { wallClockToInstant } from "~/lib/time-zone";
import { readAgencySettings } from "./agency-settings.server";
import { apparatusFactsMap, productFactsMap } from "./catalogue.server";
import { foamSystemFactsMap } from "./foam-system-facts.server";
import { allocateEventNumber, agencyYear } from "./event-number.server";
import { reportRecordOf } from "./event-read.server";
import { recomputeEventGeography } from "./geography.server";
import { deliverPendingMailSoon } from "./mail-outbox.server";
import { queueFiledReportAlerts, queueReturnedReportNotice } from "./report-notifications.server";
import { postReportStock } from "./stock.server";
import {
  dischargeInputs,
  tankReadingInputs,
  totalsColumns,
  writeReportLines,
  type ReportDischarge,
  type ReportLines,
  type ReportTankReading,
} from "./report-rows.server";
import { bumpDataVersion } from "./data-version.server";

type TankReadingLine = NonNullable<FiledReport["tankReadings"]>[number];

/** The discharges as typed (wall-clock times, minutes or a start and end) as they are stored. */
function storedDischarges(lines: DischargeLine[], timeZone: string): ReportDischarge[] {
  return lines.map((line) => ({
    apparatusId: line.apparatusId ?? null,
    outlet: line.outlet,
    productId: line.productId ?? null,
    percent: line.productId ? (line.percent ?? null) : null,
    flow: line.flow,
    flowUnit: line.flowUnit,
    basis: line.basis,
    percentOf: line.percentOf ?? null,
    minutes: lineMinutes(line, timeZone),
    startedAt: wallClockToInstant(line.startedAt, timeZone),
    endedAt: wallClockToInstant(line.endedAt, timeZone),
    method: line.method ?? null,
    airFlowCfm: line.airFlowCfm ?? null,
    mutualAidAgency: line.mutualAidAgency || null,
    mutualAidUnit: line.mutualAidUnit || null,
    heldUseReason: line.heldUseReason ?? null,
  }));
}

/** The report's lines as the row writer takes them. */
function storedLines(lines: Lines, timeZone: string): ReportLines {
  return {
    discharges: storedDischarges(lines.discharges, timeZone),
    dispositions: lines.dispositions,
    tankReadings: storedTankReadings(lines.tankReadings),
  };
}

function storedTankReadings(lines: TankReadingLine[] = []): ReportTankReading[] {
  return lines.map((line) => ({ ...line, apparatusId: line.apparatusId ?? null, productId: line.productId ?? null }));
}

/** The server's computation for a set of discharge inputs, with the catalogue facts they name. */
export async function computeForInputs(
  inputs: DischargeInput[],
  options: {
    tankReadings?: TankReading[];
    eventWindow?: { start: Date | null; end: Date | null };
    eventKind?: EventKind;
  } = {},
  connection: Db = db,
): Promise<UsageResult> {
  const apparatusIds = [
    ...inputs.flatMap((input) => (input.apparatusId ? [input.apparatusId] : [])),
    ...(options.tankReadings ?? []).flatMap((reading) => (reading.apparatusId ? [reading.apparatusId] : [])),
  ];
  const [products, apparatus, settings, foamSystems] = await Promise.all([
    productFactsMap(
      inputs.flatMap((input) => (input.productId ? [input.productId] : [])),
      connection,
    ),
    apparatusFactsMap(apparatusIds, connection),
    readAgencySettings(connection),
    foamSystemFactsMap(connection, apparatusIds),
  ]);
  return computeUsage(inputs, {
    products,
    apparatus,
    foamSystems,
    eventWindow: options.eventWindow,
    tankReadings: options.tankReadings,
    drawdownTolerance: settings.drawdownToleranceShare,
    eventKind: options.eventKind,
  });
}

// ---------------------------------------------------------------------------------------------
// Saving

export type SaveRequest = {
  user: SessionUser;
  intent: "save-draft" | "file";
  eventId?: number;
  version?: number;
  submissionKey: string;
  /** Exactly what the form sent, kept for drafts. */
  payload: Record<string, unknown>;
  /** The strictly validated report (filing only). */
  report?: FiledReport;
  revisionReason?: string;
  clientAddress?: string;
};

export type SaveOutcome =
  | { kind: "saved"; eventId: number; status: EventStatus; usage: UsageResult }
  | { kind: "repeat"; eventId: number }
  | Refusal;

const text = (value: unknown, max: number) => (typeof value === "string" ? value.trim().slice(0, max) : "");
const numeric = (value: unknown) =>
  typeof value === "string" && value.trim() !== "" ? decimalOrNull(value.trim()) : decimalOrNull(value);

/** What can be read from a draft as typed; everything else stays in `draft_json`. */
export function draftColumns(payload: Record<string, unknown>, timeZone: string) {
  const kind = EVENT_KINDS.includes(payload.kind as EventKind) ? (payload.kind as EventKind) : "incident";
  const latitude = numeric(payload.latitude);
  const longitude = numeric(payload.longitude);
  const stationId = numeric(payload.stationId);
  const incidentType = INCIDENT_TYPES.includes(payload.incidentType as IncidentType)
    ? (payload.incidentType as IncidentType)
    : DEFAULT_INCIDENT_TYPE[kind];
  return {
    number: text(payload.number, 32),
    kind,
    incident_type: incidentType,
    dispatch_number: text(payload.dispatchNumber, 32) || null,
    started_at: wallClockToInstant(text(payload.startedAt, 19), timeZone),
    cleared_at: wallClockToInstant(text(payload.clearedAt, 19), timeZone),
    address: text(payload.address, 200),
    latitude: latitude != null && Math.abs(latitude) <= 90 ? latitude : null,
    longitude: longitude != null && Math.abs(longitude) <= 180 ? longitude : null,
    station_id: stationId != null && Number.isInteger(stationId) && stationId > 0 ? stationId : null,
    narrative: text(payload.narrative, 10_000),
  };
}

const NUMERIC_LINE_FIELDS = [
  "apparatusId",
  "productId",
  "percent",
  "flow",
  "minutes",
  "airFlowCfm",
  "sharePercent",
  "volumeGal",
  "refillGal",
  "levelBeforeGal",
  "levelAfterGal",
];

function coerceLine(raw: unknown): Record<string, unknown> {
  if (!raw || typeof raw !== "object") return {};
  const line: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(raw as Record<string, unknown>)) {
    if (value === "" || value == null) continue;
    line[key] = NUMERIC_LINE_FIELDS.includes(key) ? (numeric(value) ?? value) : value;
  }
  return line;
}

function asArray(value: unknown): unknown[] {
  return Array.isArray(value) ? value : [];
}

/** The lines of a draft that are complete enough to compute; the rest wait in `draft_json`. */
export function draftLines(payload: Record<string, unknown>) {
  const parse = <T>(schema: { safeParse: (v: unknown) => { success: boolean; data?: T } }, raw: unknown) => {
    const result = schema.safeParse(coerceLine(raw));
    return result.success ? [result.data as T] : [];
  };
  return {
    discharges: asArray(payload.discharges).flatMap((raw) => parse<DischargeLine>(DischargeLineSchema, raw)),
    dispositions: asArray(payload.dispositions).flatMap((raw) =>
      parse<FiledReport["dispositions"][number]>(DispositionLineSchema, raw),
    ),
    tankReadings: asArray(payload.tankReadings).flatMap((raw) => parse<TankReadingLine>(TankReadingLineSchema, raw)),
  };
}

type ReferenceLine = { apparatusId?: unknown; productId?: unknown };
type References = { stationId: unknown; discharges: ReferenceLine[]; tankReadings: ReferenceLine[] };

const REFERENCE_MESSAGES = {
  stationId: "That station is not in the list. Choose one of the agency's stations.",
  apparatusId: "That apparatus is not in the list. Choose one of the agency's apparatus.",
  productId: "That foam product is not in the list. Choose one from the catalogue.",
} as const;

/** The stations, apparatus and products a report names, as typed (a draft) or as validated (filing). */
function referencesOf(filing: boolean, payload: Record<string, unknown>, report?: FiledReport): References {
  if (filing && report) {
    return { stationId: report.stationId, discharges: report.discharges, tankReadings: report.tankReadings ?? [] };
  }
  return {
    stationId: numeric(payload.stationId),
    discharges: asArray(payload.discharges).map(coerceLine),
    tankReadings: asArray(payload.tankReadings).map(coerceLine),
  };
}

const candidateId = (value: unknown): number | null =>
  typeof value === "number" && Number.isInteger(value) && value > 0 ? value : null;

/**
 * Field errors for every station, apparatus or product the report names that does not exist, keyed
 * as the form names its fields (`discharges[2].productId`), so the save refuses at the field instead
 * of failing on a foreign key.
 */
async function unknownReferences(connection: Db, references: References): Promise<Record<string, string[]>> {
  const wanted = { stations: new Set<number>(), apparatus: new Set<number>(), foam_products: new Set<number>() };
  const station = candidateId(references.stationId);
  if (station) wanted.stations.add(station);
  for (const line of [...references.discharges, ...references.tankReadings]) {
    const apparatus = candidateId(line?.apparatusId);
    const product = candidateId(line?.productId);
    if (apparatus) wanted.apparatus.add(apparatus);
    if (product) wanted.foam_products.add(product);
  }
  const existing = async (table: keyof typeof wanted) =>
    wanted[table].size
      ? new Set<number>(
          (
            await connection(table)
              .whereIn("id", [...wanted[table]])
              .select("id")
          ).map((row: { id: number }) => row.id),
        )
      : new Set<number>();
  const [stations, apparatus, products] = await Promise.all([
    existing("stations"),
    existing("apparatus"),
    existing("foam_products"),
  ]);
  const errors: Record<string, string[]> = {};
  if (station && !stations.has(station)) errors.stationId = [REFERENCE_MESSAGES.stationId];
  const lines = (list: "discharges" | "tankReadings") =>
    references[list].forEach((line, index) => {
      const apparatusId = candidateId(line?.apparatusId);
      const productId = candidateId(line?.productId);
      if (apparatusId && !apparatus.has(apparatusId)) {
        errors[`${list}[${index}].apparatusId`] = [REFERENCE_MESSAGES.apparatusId];
      }
      if (productId && !products.has(productId)) errors[`${list}[${index}].productId`] = [REFERENCE_MESSAGES.productId];
    });
  lines("discharges");
  lines("tankReadings");
  return errors;
}

async function snapshotEvent(eventId: number, connection: Db) {
  const [event, discharges, dispositions, tankReadings] = await Promise.all([
    connection("events").where({ id: eventId }).first(),
    connection("discharges").where({ event_id: eventId }).orderBy("position"),
    connection("runoff_dispositions").where({ event_id: eventId }).orderBy("id"),
    connection("tank_readings").where({ event_id: eventId }).orderBy("id"),
  ]);
  return { event, discharges, dispositions, tankReadings };
}

type Lines = ReturnType<typeof draftLines>;

function isDuplicateKey(error: unknown, index: string): boolean {
  const failure = error as { code?: string; sqlMessage?: string };
  return failure?.code === "ER_DUP_ENTRY" && (failure.sqlMessage ?? "").includes(index);
}

const refuse = (refusal: Refusal): never => {
  throw new RefusalError(refusal);
};

/** Step 0: the submission key, claimed first; a key already used answers with its report. */
async function claimSubmissionKey(trx: Knex.Transaction, request: SaveRequest): Promise<SaveOutcome | null> {
  const previous = await trx("form_submissions").where({ submission_key: request.submissionKey }).first();
  if (previous?.event_id) return { kind: "repeat", eventId: previous.event_id };
  // A second request with this key waits here until this one commits (then it answers with this
  // report) or rolls back (then it goes on itself).
  await trx("form_submissions").insert({
    submission_key: request.submissionKey,
    user_id: request.user.id,
    event_id: null,
  });
  return null;
}

type StoredEvent = {
  id: number;
  number: string;
  status: EventStatus;
  version: number;
  revision: number;
  created_by: number;
  station_id: number | null;
};

type LoadedReport = {
  columns: ReturnType<typeof draftColumns>;
  lines: Lines;
  stored: ReportLines;
  usage: UsageResult;
  /** The stored event, locked for the save (none for a new report). */
  row: StoredEvent | null;
};

/** Step 1: what the form says, computed with the catalogue's facts, and the stored event, locked. */
async function loadReport(trx: Knex.Transaction, request: SaveRequest): Promise<LoadedReport> {
  const filing = request.intent === "file";
  const report = request.report;
  const missing = await unknownReferences(trx, referencesOf(filing, request.payload, report));
  if (Object.keys(missing).length) {
    refuse(
      refused(
        400,
        `The report was not ${filing ? "filed" : "saved"}: it names a record that does not exist. Choose again in the fields marked below; everything you typed is kept.`,
        missing,
      ),
    );
  }
  const { timeZone } = await readAgencySettings(trx);
  const columns = filing
    ? {
        number: report!.number ?? "",
        kind: report!.kind,
        incident_type: report!.incidentType ?? DEFAULT_INCIDENT_TYPE[report!.kind],
        dispatch_number: report!.dispatchNumber || null,
        started_at: wallClockToInstant(report!.startedAt, timeZone),
        cleared_at: wallClockToInstant(report!.clearedAt, timeZone),
        address: report!.address,
        latitude: report!.latitude,
        longitude: report!.longitude,
        station_id: report!.stationId,
        narrative: report!.narrative ?? "",
      }
    : draftColumns(request.payload, timeZone);
  const lines: Lines = filing
    ? { discharges: report!.discharges, dispositions: report!.dispositions, tankReadings: report!.tankReadings ?? [] }
    : draftLines(request.payload);
  const stored = storedLines(lines, timeZone);
  const usage = await computeForInputs(
    dischargeInputs(stored.discharges),
    {
      tankReadings: tankReadingInputs(stored.tankReadings),
      eventWindow: { start: columns.started_at, end: columns.cleared_at },
      eventKind: columns.kind,
    },
    trx,
  );
  if (filing) {
    const volumes = lines.dispositions.filter((line) => line.volumeGal != null);
    const released = volumes.reduce((sum, line) => sum + line.volumeGal!, 0);
    if (volumes.length && released > usage.totals.solution.gal * 1.0001) {
      refuse(
        refused(400, "The runoff volumes are more than the foam solution discharged.", {
          dispositions: [
            `The runoff volumes add up to ${released.toFixed(1)} gal, more than the ${usage.totals.solution.gal.toFixed(1)} gal of foam solution discharged.`,
          ],
        }),
      );
    }
  }
  const row = request.eventId
    ? ((await trx("events").where({ id: request.eventId }).forUpdate().first()) ?? null)
    : null;
  if (request.eventId && !row) refuse(refused(404, "This report no longer exists."));
  return { columns, lines, stored, usage, row };
}

/** `reviewEdit`: a reviewer changed a report someone else filed, with a reason. */
type StatusChange = { status: EventStatus; revision: number; revised: boolean; reviewEdit?: boolean };

/**
 * Step 2: whether this person may make this change to this report now. Access first, then the
 * version: a conflict never answers for a report one may not change.
 */
function checkStatusChange(request: SaveRequest, row: LoadedReport["row"]): StatusChange {
  const filing = request.intent === "file";
  if (!row) return { status: filing ? "filed" : "draft", revision: 0, revised: false };
  const decision = decide(request.user, changeCapabilityFor(row.status), reportRecordOf(row));
  if (decision === "hidden") refuse(refused(404, "This report no longer exists."));
  if (decision !== "allow") refuse(refused(403, "Your roles do not allow you to change this report."));
  if (row.version !== request.version) {
    refuse(
      conflict(
        "Someone else saved this report while you were editing it. Your changes are still in the form below and have not been saved; open the report in a new tab to see theirs, then file again to replace them.",
      ),
    );
  }
  if (row.status === "accepted") {
    if (!filing) {
      refuse(
        refused(400, "An accepted report is not kept as a draft. File the change as a revision, with its reason."),
      );
    }
    if (!request.revisionReason) {
      refuse(
        refused(400, "Give the reason for changing an accepted report.", {
          revisionReason: ["Give the reason for changing an accepted report."],
        }),
      );
    }
    return { status: "filed", revision: row.revision + 1, revised: true };
  }
  if (row.status === "filed" && !filing) {
    refuse(refused(400, "This report has been filed. Change it and file it again, or wait for the review."));
  }
  const reviewEdit = changeReasonFor(request.user, reportRecordOf(row)) === "review-edit";
  if (reviewEdit && !request.revisionReason) {
    refuse(
      refused(400, "Give the reason for changing a report someone else filed.", {
        revisionReason: ["Give the reason for changing a report someone else filed; it is kept in the history."],
      }),
    );
  }
  return {
    status: filing ? "filed" : row.status === "returned" ? "returned" : "draft",
    revision: row.revision,
    revised: false,
    reviewEdit,
  };
}

/** Step 3: the event row (a number allocated when none was typed), its lines and the key's report. */
async function writeReport(
  trx: Knex.Transaction,
  request: SaveRequest,
  loaded: LoadedReport,
  change: StatusChange,
  before: Awaited<ReturnType<typeof snapshotEvent>> | null,
): Promise<number> {
  const filing = request.intent === "file";
  const { columns, usage, row } = loaded;
  const common = {
    ...columns,
    status: change.status,
    draft_json: filing ? null : JSON.stringify(request.payload),
    ...(filing ? { filed_by: request.user.id, filed_at: trx.fn.now() } : {}),
    ...totalsColumns(usage),
  };
  let eventId: number;
  if (row) {
    eventId = row.id;
    if (change.revised) {
      await trx("event_revisions").insert({
        event_id: eventId,
        revision: row.revision,
        reason: request.revisionReason,
        snapshot_json: JSON.stringify(before),
        created_by: request.user.id,
      });
    }
    await trx("events")
      .where({ id: eventId })
      .update({
        ...common,
        number: columns.number || row.number,
        version: row.version + 1,
        revision: change.revision,
        updated_at: trx.fn.now(),
      });
  } else {
    const year = await agencyYear(columns.started_at ?? new Date(), trx);
    const number = columns.number || (await allocateEventNumber(trx, columns.kind, year));
    [eventId] = await trx("events").insert({ ...common, number, version: 1, created_by: request.user.id });
  }
  await writeReportLines(trx, eventId, loaded.stored, usage, { replace: true });
  await trx("form_submissions").where({ submission_key: request.submissionKey }).update({ event_id: eventId });
  return eventId;
}

/** Step 4: the audit row, with the report before and after. */
async function auditReport(
  trx: Knex.Transaction,
  request: SaveRequest,
  eventId: number,
  change: StatusChange,
  before: Awaited<ReturnType<typeof snapshotEvent>> | null,
  lines: Lines,
) {
  const filing = request.intent === "file";
  const after = await snapshotEvent(eventId, trx);
  const action = change.revised
    ? "report_revised"
    : change.reviewEdit
      ? "report_changed_in_review"
      : filing
        ? "report_filed"
        : before
          ? "report_draft_saved"
          : "report_created";
  const count = lines.discharges.length;
  await recordAudit(
    {
      actorUserId: request.user.id,
      actorLabel: request.user.email,
      action,
      entityType: "event",
      entityId: eventId,
      summary: change.revised
        ? `Revision ${change.revision}: ${request.revisionReason}`
        : change.reviewEdit
          ? `Reason: ${request.revisionReason}`
          : filing
            ? `Filed with ${count} discharge${count === 1 ? "" : "s"}`
            : "Draft saved",
      before: before ?? undefined,
      after,
      clientAddress: request.clientAddress,
    },
    trx,
  );
}

/**
 * Saves a draft or files a report in one transaction: never half a report. Load → check the status
 * change → write → audit, then what always goes with a save in the same transaction: the stored
 * geography checks, and for a filed report its release alerts (mail is sent after commit). A repeated
 * submission key answers with the report it already made; a stale version is a conflict, never an
 * overwrite.
 */
/**
 * The one save path, inside a transaction the caller holds (a flush's maintenance entry files its
 * usage report in its own transaction). A refusal is thrown as a `RefusalError`; mail queued by a
 * filing is delivered once the caller commits (`deliverPendingMailSoon`).
 */
export async function saveReportWithin(trx: Knex.Transaction, saveRequest: SaveRequest): Promise<SaveOutcome> {
  const request = { ...saveRequest, payload: boundedDraft(saveRequest.payload) };
  const filing = request.intent === "file";
  if (filing && !request.report) throw new Error("filing needs a validated report");
  const repeat = await claimSubmissionKey(trx, request);
  if (repeat) return repeat;
  const loaded = await loadReport(trx, request);
  const change = checkStatusChange(request, loaded.row);
  const before = loaded.row ? await snapshotEvent(loaded.row.id, trx) : null;
  const eventId = await writeReport(trx, request, loaded, change, before);
  await auditReport(trx, request, eventId, change, before, loaded.lines);
  await recomputeEventGeography(eventId, trx);
  if (filing) await queueFiledReportAlerts(eventId, trx);
  if (filing) await postReportStock(trx, eventId, request.user);
  return { kind: "saved", eventId, status: change.status, usage: loaded.usage };
}

export async function saveReport(saveRequest: SaveRequest): Promise<SaveOutcome> {
  const request = { ...saveRequest, payload: boundedDraft(saveRequest.payload) };
  const filing = request.intent === "file";
  if (filing && !request.report) throw new Error("filing needs a validated report");
  try {
    const outcome = await db.transaction((trx) => saveReportWithin(trx, request));
    if (outcome.kind === "saved" && outcome.status === "filed") deliverPendingMailSoon();
    return outcome;
  } catch (error) {
    if (error instanceof RefusalError) return error.refusal;
    if (isDuplicateKey(error, "number")) {
      return refused(400, "Another report already uses this event number.", {
        number: ["Another report already uses this event number."],
      });
    }
    if (isDuplicateKey(error, "PRIMARY")) {
      // Two submissions with one key raced; the first one won.
      const previous = await db("form_submissions").where({ submission_key: request.submissionKey }).first();
      if (previous?.event_id) return { kind: "repeat", eventId: previous.event_id };
    }
    throw error;
  }
}

// ---------------------------------------------------------------------------------------------
// Review

export type ReviewOutcome = { kind: "done"; status: EventStatus } | Refusal;

/** Accepts or returns a filed report; a returned one notifies its officer in the same transaction. */
export async function reviewReport(args: {
  user: SessionUser;
  eventId: number;
  version: number;
  decision: "accept" | "return";
  comment?: string;
  clientAddress?: string;
}): Promise<ReviewOutcome> {
  const outcome = await db.transaction(async (trx): Promise<ReviewOutcome> => {
    const row = await trx("events").where({ id: args.eventId }).forUpdate().first();
    // Access first, then the version: a conflict never answers for a report one may not review.
    const decision = row ? decide(args.user, "report.review", reportRecordOf(row)) : "hidden";
    if (decision === "hidden") return refused(404, "This report no longer exists.");
    if (decision !== "allow") return refused(403, "Your roles do not allow this.");
    if (row.version !== args.version) {
      return conflict("The report changed while you were reviewing it. Review the latest version below.");
    }
    if (row.status !== "filed") return refused(400, "Only a filed report can be accepted or returned.");
    const status: EventStatus = args.decision === "accept" ? "accepted" : "returned";
    await trx("events")
      .where({ id: args.eventId })
      .update({
        status,
        version: row.version + 1,
        reviewed_by: args.user.id,
        reviewed_at: trx.fn.now(),
        review_comment: args.comment || null,
        updated_at: trx.fn.now(),
      });
    await bumpDataVersion(trx, "reports");
    await recordAudit(
      {
        actorUserId: args.user.id,
        actorLabel: args.user.email,
        action: args.decision === "accept" ? "report_accepted" : "report_returned",
        entityType: "event",
        entityId: args.eventId,
        summary: args.comment || undefined,
        before: { status: row.status, version: row.version },
        after: { status, version: row.version + 1 },
        clientAddress: args.clientAddress,
      },
      trx,
    );
    if (status === "returned") await queueReturnedReportNotice(args.eventId, args.comment ?? "", trx);
    return { kind: "done", status };
  });
  if (outcome.kind === "done" && outcome.status === "returned") deliverPendingMailSoon();
  return outcome;
}

/** A saved report's number and status, for the API's answer to a save. */
export async function reportSummary(eventId: number): Promise<{ number: string; status: EventStatus } | null> {
  const row = await db("events").where({ id: eventId }).first("number", "status");
  return row ? { number: row.number, status: row.status } : null;
}
