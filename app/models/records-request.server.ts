import { randomInt } from "node:crypto";
import { db, type Db } from "~/lib/db.server";
import { env } from "~/lib/env.server";
import {
  RECORDS_REQUEST_CLOSED,
  RECORDS_REQUEST_STATUS_LABELS,
  RECORDS_REQUEST_STATUSES,
  type RecordsRequestStatus,
} from "~/lib/foam/vocabulary";
import {
  addCalendarDays,
  businessDaysBetween,
  countStartDate,
  dueDate,
  type DueRule,
  isDueRuleKey,
  RECORDS_DUE_RULES,
} from "~/lib/records/due-date";
import type { RecordsRequestInput } from "~/lib/records/request-form";
import { DUE_SOON_BUSINESS_DAYS } from "~/lib/records/urgency";
import { instantToWallClock } from "~/lib/time-zone";
import { queueMail } from "./mail-outbox.server";
import { type AgencySettings, agencyNameForDocuments, readAgencySettings } from "./agency-settings.server";

// No 0/O or 1/I/L, so a code read aloud or copied by hand survives.
const CODE_ALPHABET = "23456789ABCDEFGHJKMNPQRSTUVWXYZ";

export function newTrackingCode(): string {
  let code = "";
  for (let index = 0; index < 10; index += 1) code += CODE_ALPHABET[randomInt(CODE_ALPHABET.length)];
  return `RR-${code.slice(0, 5)}-${code.slice(5)}`;
}

export function dueRuleOf(settings: AgencySettings): DueRule {
  return isDueRuleKey(settings.recordsDueRule) ? RECORDS_DUE_RULES[settings.recordsDueRule] : RECORDS_DUE_RULES.federal;
}

/** Day 0 and the due date for a request received at `receivedAt`, by the agency's rule. */
export function scheduleFor(receivedAt: Date, settings: AgencySettings) {
  const wallClock = instantToWallClock(receivedAt, settings.timeZone);
  const calendar = { closureDays: settings.recordsClosureDays };
  const countedFrom = countStartDate(
    wallClock.slice(0, 10),
    wallClock.slice(11, 16),
    settings.recordsOfficeCloses,
    calendar,
  );
  return { countedFrom, dueOn: dueDate(countedFrom, dueRuleOf(settings), calendar) };
}

export async function logStep(
  connection: Db,
  requestId: number,
  actorId: number | null,
  action: string,
  detail: string,
): Promise<void> {
  await connection("records_request_log").insert({ request_id: requestId, actor_id: actorId, action, detail });
}

function isoDateOf(value: unknown): string | null {
  if (!value) return null;
  if (value instanceof Date) return value.toISOString().slice(0, 10);
  return String(value).slice(0, 10);
}

/** Records a public request, its first log line and the acknowledgement e-mail, in one transaction. */
export type NewRecordsRequest = Pick<RecordsRequestInput, "name" | "email" | "description"> &
  Partial<Omit<RecordsRequestInput, "name" | "email" | "description" | "website">>;

export async function createRecordsRequest(
  input: NewRecordsRequest,
  receivedAt: Date = new Date(),
): Promise<{ id: number; trackingCode: string; dueOn: string }> {
  return db.transaction(async (trx) => {
    const settings = await readAgencySettings(trx);
    const { countedFrom, dueOn } = scheduleFor(receivedAt, settings);
    const trackingCode = newTrackingCode();
    const [id] = await trx("records_requests").insert({
      tracking_code: trackingCode,
      status: "received",
      requester_name: input.name,
      requester_email: input.email,
      requester_phone: input.phone ?? null,
      requester_organisation: input.organisation ?? null,
      description: input.description,
      range_from: input.from ?? null,
      range_to: input.to ?? null,
      place_address: input.address ?? null,
      place_lat: input.lat ?? null,
      place_lon: input.lon ?? null,
      received_at: receivedAt,
      counted_from: countedFrom,
      due_on: dueOn,
    });
    const rule = dueRuleOf(settings);
    await logStep(
      trx,
      id,
      null,
      "received",
      `Received; day 0 is ${countedFrom}; due ${dueOn} (${rule.label}, ${rule.source}).`,
    );
    const statusUrl = new URL(`/records-requests/${trackingCode}`, env().APP_URL).toString();
    await queueMail(
      {
        kind: "records_acknowledgement",
        to: [input.email],
        subject: `Your public-records request ${trackingCode}`,
        text: [
          `${agencyNameForDocuments(settings)} received your public-records request on ${instantToWallClock(receivedAt, settings.timeZone).replace("T", " at ")}.`,
          "",
          `Tracking code: ${trackingCode}`,
          `An answer is due by ${dueOn}.`,
          `Its status: ${statusUrl}`,
          "",
          "What you asked for:",
          input.description,
        ].join("\n"),
      },
      trx,
    );
    return { id, trackingCode, dueOn };
  });
}

/** What anyone with the tracking code may see: the status and the due date, nothing else. */
export async function publicStatusOf(trackingCode: string) {
  const row = await db("records_requests").where({ tracking_code: trackingCode }).first("status", "due_on");
  if (!row) return null;
  const status = row.status as RecordsRequestStatus;
  return { trackingCode, status, statusLabel: RECORDS_REQUEST_STATUS_LABELS[status], dueOn: isoDateOf(row.due_on)! };
}

export const QUEUE_SORTS = ["received", "due", "status", "assignee"] as const;
export type QueueSort = (typeof QUEUE_SORTS)[number];
const SORT_COLUMNS: Record<QueueSort, string> = {
  received: "r.received_at",
  due: "r.due_on",
  status: "r.status",
  assignee: "u.name",
};

export type QueueFilters = {
  status?: RecordsRequestStatus | "open" | "all";
  assignee?: number | "none";
  sort?: QueueSort;
  dir?: "asc" | "desc";
};

export type QueueItem = {
  id: number;
  trackingCode: string;
  status: RecordsRequestStatus;
  statusLabel: string;
  receivedAt: string;
  dueOn: string;
  daysLeft: number | null;
  urgency: "overdue" | "due-soon" | "on-time" | "closed";
  assignee: { id: number; name: string } | null;
  requesterName: string;
};

/** Today in the agency's zone. */
export function agencyToday(settings: AgencySettings, now: Date = new Date()): string {
  return instantToWallClock(now, settings.timeZone).slice(0, 10);
}

function urgencyOf(status: RecordsRequestStatus, daysLeft: number): QueueItem["urgency"] {
  if (RECORDS_REQUEST_CLOSED.includes(status)) return "closed";
  if (daysLeft < 0) return "overdue";
  return daysLeft <= DUE_SOON_BUSINESS_DAYS ? "due-soon" : "on-time";
}

/** The clerk's queue, filtered and sorted in the database. */
export async function listRecordsRequests(filters: QueueFilters = {}, now: Date = new Date()): Promise<QueueItem[]> {
  const settings = await readAgencySettings();
  const today = agencyToday(settings, now);
  const query = db("records_requests as r")
    .leftJoin("users as u", "u.id", "r.assignee_id")
    .select(
      "r.id",
      "r.tracking_code",
      "r.status",
      "r.received_at",
      "r.due_on",
      "r.assignee_id",
      "u.name as assignee_name",
      "r.requester_name",
    );
  const status = filters.status ?? "open";
  if (status === "open") query.whereNotIn("r.status", RECORDS_REQUEST_CLOSED as RecordsRequestStatus[]);
  else if (status !== "all") query.where("r.status", status);
  if (filters.assignee === "none") query.whereNull("r.assignee_id");
  else if (typeof filters.assignee === "number") query.where("r.assignee_id", filters.assignee);
  query
    .orderBy(SORT_COLUMNS[filters.sort ?? "due"], filters.dir ?? "asc")
    .orderBy("r.id", "asc")
    .limit(500);
  const calendar = { closureDays: settings.recordsClosureDays };
  return (await query).map((row) => {
    const rowStatus = row.status as RecordsRequestStatus;
    const dueOn = isoDateOf(row.due_on)!;
    const closed = RECORDS_REQUEST_CLOSED.includes(rowStatus);
    const daysLeft = businessDaysBetween(today, dueOn, calendar);
    return {
      id: row.id,
      trackingCode: row.tracking_code,
      status: rowStatus,
      statusLabel: RECORDS_REQUEST_STATUS_LABELS[rowStatus],
      receivedAt: new Date(row.received_at).toISOString(),
      dueOn,
      daysLeft: closed ? null : daysLeft,
      urgency: urgencyOf(rowStatus, daysLeft),
      assignee: row.assignee_id ? { id: row.assignee_id, name: row.assignee_name } : null,
      requesterName: row.requester_name,
    };
  });
}

export type RecordsRequestDetail = QueueItem & {
  requester: { name: string; email: string; phone: string | null; organisation: string | null };
  description: string;
  rangeFrom: string | null;
  rangeTo: string | null;
  place: { address: string | null; lat: number | null; lon: number | null };
  countedFrom: string;
  log: Array<{ at: string; actor: string | null; action: string; detail: string }>;
  packages: Array<{
    id: number;
    builtAt: string;
    sentAt: string | null;
    manifestSha256: string;
    files: Array<{ id: number; fileName: string; byteSize: number; sha256: string }>;
  }>;
};

export async function getRecordsRequest(id: number, now: Date = new Date()): Promise<RecordsRequestDetail | null> {
  const row = await db("records_requests").where({ id }).first();
  if (!row) return null;
  const [item] = (await listRecordsRequests({ status: "all" }, now)).filter((candidate) => candidate.id === id);
  const log = await db("records_request_log as l")
    .leftJoin("users as u", "u.id", "l.actor_id")
    .where("l.request_id", id)
    .orderBy("l.id")
    .select("l.at", "u.name", "l.action", "l.detail");
  const packages = await db("records_packages").where({ request_id: id }).orderBy("id");
  const files = packages.length
    ? await db("records_package_files")
        .whereIn(
          "package_id",
          packages.map((entry) => entry.id),
        )
        .orderBy("id")
    : [];
  const number = (value: unknown) => (value === null || value === undefined ? null : Number(value));
  return {
    ...item,
    requester: {
      name: row.requester_name,
      email: row.requester_email,
      phone: row.requester_phone,
      organisation: row.requester_organisation,
    },
    description: row.description,
    rangeFrom: isoDateOf(row.range_from),
    rangeTo: isoDateOf(row.range_to),
    place: { address: row.place_address, lat: number(row.place_lat), lon: number(row.place_lon) },
    countedFrom: isoDateOf(row.counted_from)!,
    log: log.map((entry) => ({
      at: new Date(entry.at).toISOString(),
      actor: entry.name ?? null,
      action: entry.action,
      detail: entry.detail,
    })),
    packages: packages.map((entry) => ({
      id: entry.id,
      builtAt: new Date(entry.built_at).toISOString(),
      sentAt: entry.sent_at ? new Date(entry.sent_at).toISOString() : null,
      manifestSha256: entry.manifest_sha256,
      files: files
        .filter((file) => file.package_id === entry.id)
        .map((file) => ({ id: file.id, fileName: file.file_name, byteSize: file.byte_size, sha256: file.sha256 })),
    })),
  };
}

export type RequestChange =
  | { intent: "status"; status: RecordsRequestStatus; note?: string }
  | { intent: "assign"; assigneeId: number | null }
  | { intent: "extend"; days: number; reason: string };

export class RequestChangeRefused extends Error {}

/** Changes a request and logs the step, in one transaction. */
export async function changeRecordsRequest(id: number, actorId: number, change: RequestChange): Promise<void> {
  await db.transaction(async (trx) => {
    const row = await trx("records_requests").where({ id }).forUpdate().first();
    if (!row) throw new RequestChangeRefused("There is no such request.");
    if (change.intent === "status") {
      if (!RECORDS_REQUEST_STATUSES.includes(change.status)) throw new RequestChangeRefused("Not a status.");
      const closed = RECORDS_REQUEST_CLOSED.includes(change.status);
      await trx("records_requests")
        .where({ id })
        .update({ status: change.status, closed_at: closed ? trx.fn.now(3) : null });
      const label = RECORDS_REQUEST_STATUS_LABELS[change.status];
      await logStep(trx, id, actorId, "status", change.note ? `${label}: ${change.note}` : label);
    } else if (change.intent === "assign") {
      let name = "nobody";
      if (change.assigneeId !== null) {
        const person = await trx("user_roles as r")
          .join("users as u", "u.id", "r.user_id")
          .where("u.id", change.assigneeId)
          .whereIn("r.role", ["records", "admin"])
          .first("u.name");
        if (!person) throw new RequestChangeRefused("Assign the request to a records clerk or an administrator.");
        name = person.name;
      }
      await trx("records_requests").where({ id }).update({ assignee_id: change.assigneeId });
      await logStep(trx, id, actorId, "assigned", `Assigned to ${name}.`);
    } else {
      const settings = await readAgencySettings(trx);
      const rule = dueRuleOf(settings);
      const calendar = { closureDays: settings.recordsClosureDays };
      const from = isoDateOf(row.due_on)!;
      const dueOn = rule.calendarDays
        ? addCalendarDays(from, change.days)
        : dueDate(from, { ...rule, days: 0 }, calendar, change.days);
      await trx("records_requests").where({ id }).update({ due_on: dueOn });
      await logStep(
        trx,
        id,
        actorId,
        "extended",
        `Due date moved from ${from} to ${dueOn} (${change.days} days): ${change.reason}`,
      );
    }
  });
}

/** The people a request may be assigned to: active records clerks and administrators. */
export async function listRecordsAssignees(): Promise<Array<{ id: number; name: string }>> {
  return db("users as u")
    .join("user_roles as r", "r.user_id", "u.id")
    .where("u.active", true)
    .whereIn("r.role", ["records", "admin"])
    .distinct("u.id", "u.name")
    .orderBy("u.name");
}

/** Whether a records request exists (for routes that hang files on it). */
export async function recordsRequestExists(id: number): Promise<boolean> {
  return Boolean(await db("records_requests").where({ id }).first("id"));
}
