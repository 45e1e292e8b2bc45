import type { Knex } from "knex";
import { recordAudit } from "~/lib/audit.server";
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
import { changeCapabilityFor, decide } from "~/lib/access";
import { EVENT_KINDS, type EventKind, type EventStatus } from "~/lib/foam/vocabulary";
import { instantToWallClock, wallClockToInstant } from "~/lib/time-zone";
import { readAgencySettings } from "./agency-settings.server";
import { apparatusFactsMap, productFactsMap } from "./catalogue.server";
import { reportRecordOf } from "./event-read.server";
import {
  dischargeInputs,
  tankReadingInputs,
  totalsColumns,
  writeReportLines,
  type ReportDischarge,
  type ReportLines,
  type ReportTankReading,
} from "./report-rows.server";

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
    minutes: lineMinutes(line),
    startedAt: wallClockToInstant(line.startedAt, timeZone),
    endedAt: wallClockToInstant(line.endedAt, timeZone),
    method: line.method ?? null,
    airFlowCfm: line.airFlowCfm ?? null,
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
  options: { tankReadings?: TankReading[]; eventWindow?: { start: Date | null; end: Date | null } } = {},
  connection: Db = db,
): Promise<UsageResult> {
  const [products, apparatus, settings] = await Promise.all([
    productFactsMap(
      inputs.flatMap((input) => (input.productId ? [input.productId] : [])),
      connection,
    ),
    apparatusFactsMap(
      [
        ...inputs.flatMap((input) => (input.apparatusId ? [input.apparatusId] : [])),
        ...(options.tankReadings ?? []).flatMap((reading) => (reading.apparatusId ? [reading.apparatusId] : [])),
      ],
      connection,
    ),
    readAgencySettings(connection),
  ]);
  return computeUsage(inputs, {
    products,
    apparatus,
    eventWindow: options.eventWindow,
    tankReadings: options.tankReadings,
    drawdownTolerance: settings.drawdownToleranceShare,
  });
}

export async function computeReport(
  report: Pick<FiledReport, "discharges" | "tankReadings" | "startedAt" | "clearedAt">,
  connection: Db = db,
): Promise<UsageResult> {
  const { timeZone } = await readAgencySettings(connection);
  return computeForInputs(
    dischargeInputs(storedDischarges(report.discharges, timeZone)),
    {
      tankReadings: tankReadingInputs(storedTankReadings(report.tankReadings)),
      eventWindow: {
        start: wallClockToInstant(report.startedAt, timeZone),
        end: wallClockToInstant(report.clearedAt, timeZone),
      },
    },
    connection,
  );
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
  | { kind: "conflict"; message: string }
  | { kind: "refused"; status: 403 | 404 | 400; message: string; fieldErrors?: Record<string, string[]> };

export class SaveRefused extends Error {
  constructor(readonly outcome: Exclude<SaveOutcome, { kind: "saved" } | { kind: "repeat" }>) {
    super("save refused");
  }
}

const text = (value: unknown, max: number) => (typeof value === "string" ? value.trim().slice(0, max) : "");
const numeric = (value: unknown) =>
  typeof value === "string" && value.trim() !== "" ? decimalOrNull(value.trim()) : decimalOrNull(value);

/** What can be read from a draft as typed; everything else stays in `draft_json`. */
export function draftColumns(payload: Record<string, unknown>, timeZone: string) {
  const kind = EVENT_KINDS.includes(payload.kind as EventKind) ? (payload.kind as EventKind) : "incident";
  const latitude = numeric(payload.latitude);
  const longitude = numeric(payload.longitude);
  const stationId = numeric(payload.stationId);
  return {
    number: text(payload.number, 32),
    kind,
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

async function nextEventNumber(connection: Db, kind: EventKind, year: number): Promise<string> {
  const prefix = { incident: "AB", training: "TR", test: "PT", flush: "FL" }[kind];
  const stem = `${prefix}-${year}-`;
  const last = await connection("events").where("number", "like", `${stem}%`).max({ number: "number" }).first();
  const lastSequence = last?.number ? Number(String(last.number).slice(stem.length)) || 0 : 0;
  return `${stem}${String(lastSequence + 1).padStart(4, "0")}`;
}

/** A suggestion for a new report's number (the officer may type the dispatch number instead). */
export async function suggestEventNumber(kind: EventKind = "incident", now = new Date()): Promise<string> {
  const year = Number(instantToWallClock(now, (await readAgencySettings()).timeZone).slice(0, 4));
  return nextEventNumber(db, kind, year);
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

export type SaveHooks = {
  /** Runs inside the transaction after a report is filed (alerts are queued with the report or not at all). */
  afterFiled?: (eventId: number, trx: Knex.Transaction) => Promise<void>;
  /** Runs inside the transaction after any save (stored geography checks). */
  afterSaved?: (eventId: number, trx: Knex.Transaction) => Promise<void>;
};

function isDuplicateKey(error: unknown, index: string): boolean {
  const failure = error as { code?: string; sqlMessage?: string };
  return failure?.code === "ER_DUP_ENTRY" && (failure.sqlMessage ?? "").includes(index);
}

/**
 * Saves a draft or files a report in one transaction: never half a report. A repeated submission
 * key answers with the report it already made; a stale version is a conflict, never an overwrite.
 */
export async function saveReport(saveRequest: SaveRequest, hooks: SaveHooks = {}): Promise<SaveOutcome> {
  const request = { ...saveRequest, payload: boundedDraft(saveRequest.payload) };
  const filing = request.intent === "file";
  if (filing && !request.report) throw new Error("filing needs a validated report");
  try {
    return await db.transaction(async (trx) => {
      const previous = await trx("form_submissions").where({ submission_key: request.submissionKey }).first();
      if (previous?.event_id) return { kind: "repeat", eventId: previous.event_id } as const;

      const report = request.report;
      const { timeZone } = await readAgencySettings(trx);
      const columns = filing
        ? {
            number: report!.number,
            kind: report!.kind,
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
        ? {
            discharges: report!.discharges,
            dispositions: report!.dispositions,
            tankReadings: report!.tankReadings ?? [],
          }
        : draftLines(request.payload);
      const stored = storedLines(lines, timeZone);
      const usage = await computeForInputs(
        dischargeInputs(stored.discharges),
        {
          tankReadings: tankReadingInputs(stored.tankReadings),
          eventWindow: { start: columns.started_at, end: columns.cleared_at },
        },
        trx,
      );
      if (filing) {
        const volumes = lines.dispositions.filter((line) => line.volumeGal != null);
        const released = volumes.reduce((sum, line) => sum + line.volumeGal!, 0);
        if (volumes.length && released > usage.totals.solution.gal * 1.0001) {
          throw new SaveRefused({
            kind: "refused",
            status: 400,
            message: "The runoff volumes are more than the foam solution discharged.",
            fieldErrors: {
              dispositions: [
                `The runoff volumes add up to ${released.toFixed(1)} gal, more than the ${usage.totals.solution.gal.toFixed(1)} gal of foam solution discharged.`,
              ],
            },
          });
        }
      }

      let eventId = request.eventId;
      let before: Awaited<ReturnType<typeof snapshotEvent>> | null = null;
      let status: EventStatus;
      let revision = 0;
      if (eventId) {
        const row = await trx("events").where({ id: eventId }).forUpdate().first();
        // Access first, then the version: a conflict never answers for a report one may not change.
        const decision = row ? decide(request.user, changeCapabilityFor(row.status), reportRecordOf(row)) : "hidden";
        if (decision === "hidden") {
          throw new SaveRefused({ kind: "refused", status: 404, message: "This report no longer exists." });
        }
        if (decision !== "allow") {
          throw new SaveRefused({
            kind: "refused",
            status: 403,
            message: "Your roles do not allow you to change this report.",
          });
        }
        if (row.version !== request.version) {
          throw new SaveRefused({
            kind: "conflict",
            message:
              "Someone else saved this report while you were editing it. Your changes are still in the form below and have not been saved; open the report in a new tab to see theirs, then file again to replace them.",
          });
        }
        if (row.status === "accepted") {
          if (!filing) {
            throw new SaveRefused({
              kind: "refused",
              status: 400,
              message: "An accepted report is not kept as a draft. File the change as a revision, with its reason.",
            });
          }
          if (!request.revisionReason) {
            throw new SaveRefused({
              kind: "refused",
              status: 400,
              message: "Give the reason for changing an accepted report.",
              fieldErrors: { revisionReason: ["Give the reason for changing an accepted report."] },
            });
          }
        }
        if (row.status === "filed" && !filing) {
          throw new SaveRefused({
            kind: "refused",
            status: 400,
            message: "This report has been filed. Change it and file it again, or wait for the review.",
          });
        }
        before = await snapshotEvent(eventId, trx);
        revision = row.revision;
        if (row.status === "accepted") {
          revision = row.revision + 1;
          await trx("event_revisions").insert({
            event_id: eventId,
            revision: row.revision,
            reason: request.revisionReason,
            snapshot_json: JSON.stringify(before),
            created_by: request.user.id,
          });
        }
        status = filing ? "filed" : row.status === "returned" ? "returned" : "draft";
        await trx("events")
          .where({ id: eventId })
          .update({
            ...columns,
            number: columns.number || row.number,
            status,
            version: row.version + 1,
            revision,
            draft_json: filing ? null : JSON.stringify(request.payload),
            ...(filing ? { filed_by: request.user.id, filed_at: trx.fn.now() } : {}),
            ...totalsColumns(usage),
            updated_at: trx.fn.now(),
          });
      } else {
        status = filing ? "filed" : "draft";
        const number =
          columns.number ||
          (await nextEventNumber(trx, columns.kind, (columns.started_at ?? new Date()).getUTCFullYear()));
        [eventId] = await trx("events").insert({
          ...columns,
          number,
          status,
          version: 1,
          created_by: request.user.id,
          draft_json: filing ? null : JSON.stringify(request.payload),
          ...(filing ? { filed_by: request.user.id, filed_at: trx.fn.now() } : {}),
          ...totalsColumns(usage),
        });
      }

      await writeReportLines(trx, eventId!, stored, usage, { replace: true });
      await trx("form_submissions").insert({
        submission_key: request.submissionKey,
        user_id: request.user.id,
        event_id: eventId,
      });
      const after = await snapshotEvent(eventId!, trx);
      const revised = before !== null && revision > before.event.revision;
      const action = revised
        ? "report_revised"
        : filing
          ? "report_filed"
          : before
            ? "report_draft_saved"
            : "report_created";
      await recordAudit(
        {
          actorUserId: request.user.id,
          actorLabel: request.user.email,
          action,
          entityType: "event",
          entityId: eventId,
          summary: revised
            ? `Revision ${revision}: ${request.revisionReason}`
            : filing
              ? `Filed with ${lines.discharges.length} discharge${lines.discharges.length === 1 ? "" : "s"}`
              : "Draft saved",
          before: before ?? undefined,
          after,
          clientAddress: request.clientAddress,
        },
        trx,
      );
      await hooks.afterSaved?.(eventId!, trx);
      if (filing) await hooks.afterFiled?.(eventId!, trx);
      return { kind: "saved", eventId: eventId!, status, usage } as const;
    });
  } catch (error) {
    if (error instanceof SaveRefused) return error.outcome;
    if (isDuplicateKey(error, "number")) {
      return {
        kind: "refused",
        status: 400,
        message: "Another report already uses this event number.",
        fieldErrors: { number: ["Another report already uses this event number."] },
      };
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

export type ReviewOutcome =
  | { kind: "done"; status: EventStatus }
  | { kind: "conflict"; message: string }
  | { kind: "refused"; status: 400 | 403 | 404; message: string };

export async function reviewReport(
  args: {
    user: SessionUser;
    eventId: number;
    version: number;
    decision: "accept" | "return";
    comment?: string;
    clientAddress?: string;
  },
  hooks: { afterReturned?: (eventId: number, comment: string, trx: Knex.Transaction) => Promise<void> } = {},
): Promise<ReviewOutcome> {
  return db.transaction(async (trx) => {
    const row = await trx("events").where({ id: args.eventId }).forUpdate().first();
    // Access first, then the version: a conflict never answers for a report one may not review.
    const decision = row ? decide(args.user, "report.review", reportRecordOf(row)) : "hidden";
    if (decision === "hidden") return { kind: "refused", status: 404, message: "This report no longer exists." };
    if (decision !== "allow") return { kind: "refused", status: 403, message: "Your roles do not allow this." };
    if (row.version !== args.version) {
      return {
        kind: "conflict",
        message: "The report changed while you were reviewing it. Review the latest version below.",
      };
    }
    if (row.status !== "filed") {
      return { kind: "refused", status: 400, message: "Only a filed report can be accepted or returned." };
    }
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
    if (status === "returned") await hooks.afterReturned?.(args.eventId, args.comment ?? "", trx);
    return { kind: "done", status };
  });
}
