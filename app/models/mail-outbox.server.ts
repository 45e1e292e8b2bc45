import { recordAudit } from "~/lib/audit.server";
import { db, type Db } from "~/lib/db.server";
import { retryingDeadlocks } from "~/lib/deadlock-retry";
import { sendMail } from "~/lib/mail.server";

export type MailKind =
  | "release_alert"
  | "returned_report"
  | "quarterly_workbook"
  | "records_acknowledgement"
  | "records_release"
  | "password_reset"
  | "foam_system_reminder"
  | "stock_alert";

export type QueuedMail = {
  kind: MailKind;
  to: string[];
  subject: string;
  text: string;
  attachment?: { filename: string; contentType: string; content: Buffer } | null;
  eventId?: number | null;
  submissionId?: number | null;
};

/** After this many failed attempts a message stays `failed` until someone retries it from the outbox. */
export const MAX_ATTEMPTS = 6;

/** Minutes to wait after the nth failure: 1, 2, 4, 8, 16 (common practice, no source). */
export function retryDelayMinutes(attempts: number): number {
  return 2 ** Math.max(0, attempts - 1);
}

/** Queues a message in the caller's transaction; nothing is sent until `deliverPendingMail` runs after commit. */
export async function queueMail(mail: QueuedMail, connection: Db = db): Promise<number | null> {
  const to = [...new Set(mail.to.map((address) => address.trim()).filter(Boolean))];
  if (to.length === 0) return null;
  const [id] = await connection("mail_outbox").insert({
    kind: mail.kind,
    to_addresses: to.join(", "),
    subject: mail.subject.slice(0, 250),
    text_body: mail.text,
    attachment_name: mail.attachment?.filename ?? null,
    attachment_type: mail.attachment?.contentType ?? null,
    attachment_content: mail.attachment?.content ?? null,
    event_id: mail.eventId ?? null,
    submission_id: mail.submissionId ?? null,
  });
  return id;
}

// A message left `sending` this long (a process that died mid-send) is picked up again.
const STALE_CLAIM_MINUTES = 10;

export type DeliveryOutcome = { sent: number; failed: number; retrying: number };

/**
 * Takes up to `limit` due messages for this process: in one short transaction the rows are locked
 * with `SELECT … FOR UPDATE SKIP LOCKED` and marked `sending`, so two app servers (or the timer and
 * a route) never take the same message, and neither waits for the other's locks.
 */
async function claimDueMail(limit: number): Promise<number[]> {
  // Senders racing for the same rows can still deadlock on the status index; the victim claims again.
  return retryingDeadlocks(() => claimDueMailOnce(limit));
}

async function claimDueMailOnce(limit: number): Promise<number[]> {
  return db.transaction(async (trx) => {
    const ids: number[] = await trx("mail_outbox")
      .where((q) =>
        q
          .where((w) => w.where("status", "queued").where("next_attempt_at", "<=", trx.fn.now(3)))
          .orWhere((w) =>
            w
              .where("status", "sending")
              .where("claimed_at", "<", trx.raw("NOW(3) - INTERVAL ? MINUTE", [STALE_CLAIM_MINUTES])),
          ),
      )
      .orderBy("id")
      .limit(limit)
      .forUpdate()
      .skipLocked()
      .pluck("id");
    if (ids.length > 0) {
      await trx("mail_outbox")
        .whereIn("id", ids)
        .update({ status: "sending", claimed_at: trx.fn.now(3) });
    }
    return ids;
  });
}

/** Sends what is due, each message claimed first (`claimDueMail`). */
export async function deliverPendingMail(options: { smtpUrl?: string; limit?: number } = {}): Promise<DeliveryOutcome> {
  const outcome: DeliveryOutcome = { sent: 0, failed: 0, retrying: 0 };
  for (const id of await claimDueMail(options.limit ?? 50)) {
    const row = await db("mail_outbox").where({ id }).first();
    try {
      const { messageId } = await sendMail(
        {
          to: String(row.to_addresses).split(/,\s*/),
          subject: row.subject,
          text: row.text_body,
          attachments: row.attachment_content
            ? [{ filename: row.attachment_name, contentType: row.attachment_type, content: row.attachment_content }]
            : [],
        },
        options.smtpUrl,
      );
      await db("mail_outbox")
        .where({ id })
        .update({
          status: "sent",
          sent_at: db.fn.now(3),
          message_id: messageId.slice(0, 250),
          attempts: row.attempts + 1,
          last_error: null,
        });
      outcome.sent++;
    } catch (error) {
      const attempts = row.attempts + 1;
      const giveUp = attempts >= MAX_ATTEMPTS;
      await db("mail_outbox")
        .where({ id })
        .update({
          status: giveUp ? "failed" : "queued",
          attempts,
          last_error: (error instanceof Error ? error.message : String(error)).slice(0, 2000),
          next_attempt_at: db.raw("NOW(3) + INTERVAL ? MINUTE", [retryDelayMinutes(attempts)]),
        });
      if (giveUp) outcome.failed++;
      else outcome.retrying++;
    }
  }
  return outcome;
}

/** Runs `deliverPendingMail` without letting a mail or database fault reach the caller. */
export function deliverPendingMailSoon(): void {
  setImmediate(() => {
    deliverPendingMail().catch((error: unknown) => {
      console.warn(`Mail delivery will be retried: ${error instanceof Error ? error.message : String(error)}`);
    });
  });
}

let worker: ReturnType<typeof setInterval> | undefined;

/** The server process's sender: once at start, then every 30 s; started once by scripts/serve.js. */
export function startMailWorker(intervalMs = 30_000): void {
  if (worker) return;
  const run = () => {
    deliverPendingMail().catch((error: unknown) => {
      console.warn(`Mail delivery will be retried: ${error instanceof Error ? error.message : String(error)}`);
    });
  };
  worker = setInterval(run, intervalMs);
  worker.unref();
  setTimeout(run, 2_000).unref();
}

export type OutboxRow = {
  id: number;
  kind: MailKind;
  to: string;
  subject: string;
  status: "queued" | "sending" | "sent" | "failed" | "discarded";
  attempts: number;
  lastError: string | null;
  nextAttemptAt: Date;
  sentAt: Date | null;
  createdAt: Date;
  attachmentName: string | null;
};

export async function listOutbox(limit = 100): Promise<OutboxRow[]> {
  const rows = await db("mail_outbox")
    .orderBy("id", "desc")
    .limit(limit)
    .select(
      "id",
      "kind",
      "to_addresses",
      "subject",
      "status",
      "attempts",
      "last_error",
      "next_attempt_at",
      "sent_at",
      "created_at",
      "attachment_name",
    );
  return rows.map((row) => ({
    id: row.id,
    kind: row.kind,
    to: row.to_addresses,
    subject: row.subject,
    status: row.status,
    attempts: row.attempts,
    lastError: row.last_error,
    nextAttemptAt: row.next_attempt_at,
    sentAt: row.sent_at,
    createdAt: row.created_at,
    attachmentName: row.attachment_name,
  }));
}

export type OutboxActor = { id: number; email: string; clientAddress: string | null };

async function changeFromOutbox(
  id: number,
  actor: OutboxActor,
  action: "outbox_mail_retried" | "outbox_mail_discarded",
  change: Record<string, unknown>,
): Promise<boolean> {
  return db.transaction(async (trx) => {
    const row = await trx("mail_outbox")
      .where({ id })
      .whereIn("status", ["queued", "failed"])
      .forUpdate()
      .first("id", "kind", "to_addresses", "subject", "status", "attempts", "event_id", "submission_id");
    if (!row) return false;
    await trx("mail_outbox").where({ id }).update(change);
    await recordAudit(
      {
        actorUserId: actor.id,
        actorLabel: actor.email,
        action,
        entityType: "mail_outbox",
        entityId: id,
        summary: `${action === "outbox_mail_retried" ? "Retried" : "Discarded"}: ${row.subject}`,
        before: {
          status: row.status,
          attempts: row.attempts,
          kind: row.kind,
          to: row.to_addresses,
          eventId: row.event_id,
          submissionId: row.submission_id,
        },
        after: { status: change.status },
        clientAddress: actor.clientAddress,
      },
      trx,
    );
    return true;
  });
}

/** Makes a failed or waiting message due now, with an audit row naming who did it. */
export function retryMailNow(id: number, actor: OutboxActor): Promise<boolean> {
  return changeFromOutbox(id, actor, "outbox_mail_retried", { status: "queued", next_attempt_at: db.fn.now(3) });
}

/** Takes a failed or waiting message out of the queue for good (it is kept, marked discarded), audited. */
export function discardMail(id: number, actor: OutboxActor): Promise<boolean> {
  return changeFromOutbox(id, actor, "outbox_mail_discarded", { status: "discarded" });
}
