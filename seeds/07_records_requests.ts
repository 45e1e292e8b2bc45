import type { Knex } from "knex";
import { RECORDS_DUE_RULES, businessDaysBetween } from "../app/lib/records/due-date";
import { StorageUnavailableError } from "../app/lib/storage.server";
import { buildReleasePackage, sendReleasePackage } from "../app/exports/release-package.server";
import { DEFAULT_REDACTIONS } from "../app/lib/records/redaction";
import { readAgencySettings } from "../app/models/agency-settings.server";
import { agencyToday, newTrackingCode, scheduleFor } from "../app/models/records-request.server";

// Demo data only: invented public-records requests to the Alder Bend district, one in each state
// (one overdue, one due within two business days, one fulfilled with its package), dated
// relative to the day the demo is seeded so that the queue always shows them so.

type DemoRequest = {
  requester: string;
  email: string;
  organisation?: string;
  description: string;
  status: string;
  /** Calendar days before today the request came in. */
  daysAgo?: number;
  /** Or: received so that it is due within two business days. */
  dueSoon?: boolean;
  address?: string;
  range?: [string, string];
  assign?: boolean;
};

const REQUESTS: DemoRequest[] = [
  {
    requester: "Morgan Tilbury (demo)",
    email: "morgan.tilbury@example.org",
    description: "All foam used near the Willow Creek crossing in 2026, with the amounts that reached the creek.",
    status: "in_progress",
    daysAgo: 45,
    range: ["2026-01-01", "2026-06-30"],
    assign: true,
  },
  {
    requester: "Alder Bend Courier newsroom (demo)",
    email: "newsroom@courier.example",
    organisation: "Alder Bend Courier (demo)",
    description: "Reports of PFAS-containing foam used at training grounds since December 2025.",
    status: "in_progress",
    dueSoon: true,
    assign: true,
  },
  {
    requester: "Rowan Ashdown (demo)",
    email: "rowan.ashdown@example.org",
    description: "Foam used at the vehicle fire on my street in March 2026.",
    status: "received",
    daysAgo: 0,
    address: "400 block of Juniper Street, Alder Bend",
  },
  {
    requester: "Harbor & Vale attorneys (demo)",
    email: "records@harborvale.example",
    organisation: "Harbor & Vale (demo)",
    description: "Usage reports for accepted incidents from December 2025 to May 2026.",
    status: "fulfilled",
    daysAgo: 30,
    range: ["2025-12-01", "2026-05-31"],
    assign: true,
  },
  {
    requester: "Sam Okafor (demo)",
    email: "sam.okafor@example.org",
    description: "The crew roster and home addresses of the firefighters at the April 2026 training.",
    status: "withheld",
    daysAgo: 20,
  },
  {
    requester: "Creekside Watch (demo)",
    email: "info@creeksidewatch.example",
    organisation: "Creekside Watch (demo)",
    description: "Runoff records for the East Basin with the review comments.",
    status: "partly_withheld",
    daysAgo: 25,
  },
  {
    requester: "Lee Marsh (demo)",
    email: "lee.marsh@example.org",
    description: "Foam use at the grain elevator fire (asked in error; withdrawn by the requester).",
    status: "withdrawn",
    daysAgo: 12,
  },
];

const LABELS: Record<string, string> = {
  in_progress: "In progress",
  fulfilled: "Fulfilled",
  withheld: "Withheld",
  partly_withheld: "Partly withheld",
  withdrawn: "Withdrawn",
};

export async function seed(knex: Knex): Promise<void> {
  const already = await knex("records_requests").count({ n: "*" }).first();
  if (Number(already?.n ?? 0) > 0) return;
  const settings = await readAgencySettings(knex);
  const now = new Date();
  const today = agencyToday(settings, now);
  const clerk = await knex("users").where({ email: "records@alderbend.example" }).first("id");
  const calendar = { closureDays: settings.recordsClosureDays };

  const receivedFor = (request: DemoRequest): Date => {
    if (!request.dueSoon) return new Date(now.getTime() - (request.daysAgo ?? 0) * 86_400_000);
    // The latest receipt whose due date falls within the next two business days.
    for (let days = 1; days < 60; days += 1) {
      const candidate = new Date(now.getTime() - days * 86_400_000);
      const left = businessDaysBetween(today, scheduleFor(candidate, settings).dueOn, calendar);
      if (left >= 0 && left <= 2) return candidate;
    }
    return now;
  };

  let fulfilledId: number | null = null;
  for (const request of REQUESTS) {
    const receivedAt = receivedFor(request);
    // Office hours are kept: the demo receipt is at 14:00 UTC of its day.
    receivedAt.setUTCHours(14, 0, 0, 0);
    const { countedFrom, dueOn } = scheduleFor(receivedAt, settings);
    const closed = ["fulfilled", "withheld", "partly_withheld", "withdrawn"].includes(request.status);
    const [id] = await knex("records_requests").insert({
      tracking_code: newTrackingCode(),
      // The fulfilled one is closed by sending its package below.
      status: request.status === "fulfilled" ? "in_progress" : request.status,
      requester_name: request.requester,
      requester_email: request.email,
      requester_organisation: request.organisation ?? null,
      description: request.description,
      range_from: request.range?.[0] ?? null,
      range_to: request.range?.[1] ?? null,
      place_address: request.address ?? null,
      received_at: receivedAt,
      counted_from: countedFrom,
      due_on: dueOn,
      assignee_id: request.assign ? (clerk?.id ?? null) : null,
      closed_at: closed && request.status !== "fulfilled" ? new Date(receivedAt.getTime() + 5 * 86_400_000) : null,
    });
    const rule =
      RECORDS_DUE_RULES[settings.recordsDueRule as keyof typeof RECORDS_DUE_RULES] ?? RECORDS_DUE_RULES.federal;
    const log = [
      {
        action: "received",
        detail: `Received; day 0 is ${countedFrom}; due ${dueOn} (${rule.label}, ${rule.source}).`,
        actor: null,
      },
    ];
    if (request.assign)
      log.push({ action: "assigned", detail: "Assigned to Priya Santos (demo).", actor: clerk?.id ?? null });
    if (closed && request.status !== "fulfilled") {
      log.push({ action: "status", detail: `${LABELS[request.status]} (demo).`, actor: clerk?.id ?? null });
    }
    for (const [index, entry] of log.entries()) {
      await knex("records_request_log").insert({
        request_id: id,
        at: new Date(receivedAt.getTime() + index * 3_600_000),
        actor_id: entry.actor,
        action: entry.action,
        detail: entry.detail,
      });
    }
    if (request.status === "fulfilled") fulfilledId = id;
  }

  if (fulfilledId !== null && clerk) {
    const request = REQUESTS.find((entry) => entry.status === "fulfilled")!;
    try {
      const packageId = await buildReleasePackage(fulfilledId, clerk.id, {
        from: request.range?.[0],
        to: request.range?.[1],
        kind: "incident",
        redactions: DEFAULT_REDACTIONS,
      });
      await sendReleasePackage(fulfilledId, packageId, clerk.id, "fulfilled");
    } catch (error) {
      if (!(error instanceof StorageUnavailableError)) throw error;
      console.warn("The file store is not running: the demo's fulfilled request has no package.");
    }
  }
}
