import { createHash, randomBytes } from "node:crypto";
import type { Knex } from "knex";
import { recordAudit } from "~/lib/audit.server";
import { hashPassword, type SessionUser } from "~/lib/auth.server";
import { db } from "~/lib/db.server";
import { env } from "~/lib/env.server";
import { RESET_LINK_MINUTES } from "~/lib/password-reset";
import { endSessionsOf } from "~/lib/session.server";
import { deliverPendingMailSoon, queueMail } from "./mail-outbox.server";

/**
 * Password reset by e-mailed link. The link carries 32 random bytes; only their SHA-256 is stored,
 * with an expiry, and the link works once. A new link replaces any earlier unused one. The mail goes
 * through the outbox like every other message.
 */

/** A link's secret: 32 random bytes, base64url (43 characters). */
export const RESET_TOKEN_PATTERN = /^[A-Za-z0-9_-]{43}$/;

const digest = (token: string) => createHash("sha256").update(token).digest("hex");

export function resetLink(token: string): string {
  return `${env().APP_URL.replace(/\/$/, "")}/reset-password/${token}`;
}

type Requester = { id: number; email: string } | null;

async function issueLink(
  trx: Knex.Transaction,
  user: { id: number; email: string; name: string },
  requester: Requester,
  clientAddress: string | null,
): Promise<void> {
  const token = randomBytes(32).toString("base64url");
  // Earlier links still unused stop working: only the newest one opens the form.
  await trx("password_resets")
    .where({ user_id: user.id })
    .whereNull("used_at")
    .where("expires_at", ">", trx.fn.now(3))
    .update({ expires_at: trx.fn.now(3) });
  await trx("password_resets").insert({
    user_id: user.id,
    token_hash: digest(token),
    requested_by: requester?.id ?? null,
    expires_at: new Date(Date.now() + RESET_LINK_MINUTES * 60_000),
  });
  await queueMail(
    {
      kind: "password_reset",
      to: [user.email],
      subject: "Set a new Foamtally password",
      text: [
        `${user.name},`,
        "",
        requester
          ? "An administrator asked Foamtally to send you a link to set a new password."
          : "Someone, perhaps you, asked Foamtally for a link to set a new password for this address.",
        "",
        `Open this link within ${RESET_LINK_MINUTES} minutes to choose one. It works once:`,
        resetLink(token),
        "",
        "If you did not ask for it, ignore this message: your password stays as it is.",
      ].join("\n"),
    },
    trx,
  );
  await recordAudit(
    {
      actorUserId: requester?.id ?? null,
      actorLabel: requester?.email ?? user.email,
      action: "password_reset_sent",
      entityType: "user",
      entityId: user.id,
      summary: requester ? `Reset link sent to ${user.email} by an administrator` : `Reset link sent to ${user.email}`,
      clientAddress,
    },
    trx,
  );
}

/**
 * "Forgot your password?": queues a link when the address belongs to an active account, and does
 * nothing otherwise. The caller answers the same either way.
 */
export async function requestPasswordReset(email: string, clientAddress: string | null): Promise<void> {
  const user = await db("users")
    .whereRaw("LOWER(email) = ?", [email.trim().toLowerCase()])
    .where({ active: true })
    .first("id", "email", "name");
  if (!user) return;
  await db.transaction((trx) => issueLink(trx, user, null, clientAddress));
  deliverPendingMailSoon();
}

/** An administrator's "Send reset link" for one account; false when there is no active such account. */
export async function sendPasswordResetLink(
  userId: number,
  actor: SessionUser,
  clientAddress: string | null,
): Promise<boolean> {
  const sent = await db.transaction(async (trx) => {
    const user = await trx("users").where({ id: userId, active: true }).first("id", "email", "name");
    if (!user) return false;
    await issueLink(trx, user, { id: actor.id, email: actor.email }, clientAddress);
    return true;
  });
  if (sent) deliverPendingMailSoon();
  return sent;
}

/** The account a link opens, while it is unused and unexpired; null otherwise. */
export async function resetLinkAccount(token: string): Promise<{ email: string } | null> {
  if (!RESET_TOKEN_PATTERN.test(token)) return null;
  const row = await db("password_resets as r")
    .join("users as u", "u.id", "r.user_id")
    .where({ "r.token_hash": digest(token), "u.active": true })
    .whereNull("r.used_at")
    .where("r.expires_at", ">", db.fn.now(3))
    .first("u.email");
  return row ? { email: row.email as string } : null;
}

/**
 * Sets the new password through a link, once: the link is claimed (marked used) in the same
 * transaction, so two tabs sending it together set one password. Every session of the person ends.
 */
export async function resetPassword(
  token: string,
  newPassword: string,
  clientAddress: string | null,
): Promise<{ ok: true; email: string } | { ok: false }> {
  if (!RESET_TOKEN_PATTERN.test(token)) return { ok: false };
  const passwordHash = await hashPassword(newPassword);
  return db.transaction(async (trx) => {
    const row = await trx("password_resets as r")
      .join("users as u", "u.id", "r.user_id")
      .where({ "r.token_hash": digest(token), "u.active": true })
      .whereNull("r.used_at")
      .where("r.expires_at", ">", trx.fn.now(3))
      .forUpdate()
      .first("r.id", "u.id as user_id", "u.email");
    if (!row) return { ok: false } as const;
    const claimed = await trx("password_resets")
      .where({ id: row.id })
      .whereNull("used_at")
      .update({ used_at: trx.fn.now(3) });
    if (claimed !== 1) return { ok: false } as const;
    await trx("users").where({ id: row.user_id }).update({ password_hash: passwordHash, updated_at: trx.fn.now() });
    const ended = await endSessionsOf(row.user_id, { connection: trx });
    await recordAudit(
      {
        actorUserId: row.user_id,
        actorLabel: row.email,
        action: "password_reset",
        entityType: "user",
        entityId: row.user_id,
        summary: `Password set through a reset link; ${ended} session${ended === 1 ? "" : "s"} ended`,
        clientAddress,
      },
      trx,
    );
    return { ok: true, email: row.email as string } as const;
  });
}
