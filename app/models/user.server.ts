import bcrypt from "bcryptjs";
import { recordAudit } from "~/lib/audit.server";
import { hashPassword, type SessionUser } from "~/lib/auth.server";
import { db } from "~/lib/db.server";
import { activeSessionCounts, endSessionsOf } from "~/lib/session.server";
import { isRole, type Role } from "~/lib/access";

export type UserRow = {
  id: number;
  email: string;
  name: string;
  active: boolean;
  roles: Role[];
  stationId: number | null;
  /** Unexpired sessions, on any app server. */
  sessions: number;
};

export async function listUsers(): Promise<UserRow[]> {
  const [users, roles, sessions] = await Promise.all([
    db("users").select("id", "email", "name", "active", "station_id").orderBy("name"),
    db("user_roles").select("user_id", "role"),
    activeSessionCounts(),
  ]);
  return users.map((user) => ({
    id: user.id,
    email: user.email,
    name: user.name,
    active: Boolean(user.active),
    stationId: (user.station_id as number | null) ?? null,
    sessions: sessions.get(user.id) ?? 0,
    roles: roles.filter((row) => row.user_id === user.id && isRole(row.role)).map((row) => row.role as Role),
  }));
}

/** The roles an account holds now (what the access rules on accounts look at), or null if there is none. */
export async function accountRecord(userId: number): Promise<{ roles: Role[] } | null> {
  const row = await db("users").where({ id: userId }).first("id");
  if (!row) return null;
  const roles = await db("user_roles").where({ user_id: userId }).pluck("role");
  return { roles: roles.filter(isRole) };
}

export class DuplicateEmailError extends Error {}

export async function createUser(
  input: { email: string; name: string; password: string; roles: Role[]; stationId?: number | null },
  actor: SessionUser | null,
  clientAddress?: string,
): Promise<number> {
  const passwordHash = await hashPassword(input.password);
  return db.transaction(async (trx) => {
    const existing = await trx("users").where({ email: input.email }).first();
    if (existing) throw new DuplicateEmailError(input.email);
    const [id] = await trx("users").insert({
      email: input.email,
      name: input.name,
      password_hash: passwordHash,
      station_id: input.stationId ?? null,
    });
    if (input.roles.length) await trx("user_roles").insert(input.roles.map((role) => ({ user_id: id, role })));
    await recordAudit(
      {
        actorUserId: actor?.id ?? null,
        actorLabel: actor?.email ?? "seed",
        action: "user_created",
        entityType: "user",
        entityId: id,
        after: { email: input.email, name: input.name, roles: input.roles, stationId: input.stationId ?? null },
        clientAddress,
      },
      trx,
    );
    return id;
  });
}

export async function updateUser(
  userId: number,
  changes: { name: string; roles: Role[]; active: boolean; stationId: number | null },
  actor: SessionUser,
  clientAddress?: string,
): Promise<boolean> {
  return db.transaction(async (trx) => {
    const before = await trx("users").where({ id: userId }).forUpdate().first();
    if (!before) return false;
    const beforeRoles = await trx("user_roles").where({ user_id: userId }).pluck("role");
    const deactivating = Boolean(before.active) && !changes.active;
    await trx("users").where({ id: userId }).update({
      name: changes.name,
      active: changes.active,
      station_id: changes.stationId,
      updated_at: trx.fn.now(),
    });
    // A deactivated person's sessions end at once; tokens stop because the user is inactive.
    if (deactivating) await endSessionsOf(userId, { connection: trx });
    await trx("user_roles").where({ user_id: userId }).delete();
    if (changes.roles.length) await trx("user_roles").insert(changes.roles.map((role) => ({ user_id: userId, role })));
    await recordAudit(
      {
        actorUserId: actor.id,
        actorLabel: actor.email,
        action: deactivating ? "user_deactivated" : "user_updated",
        entityType: "user",
        entityId: userId,
        before: {
          name: before.name,
          active: Boolean(before.active),
          roles: beforeRoles.sort(),
          stationId: before.station_id ?? null,
        },
        after: {
          name: changes.name,
          active: changes.active,
          roles: [...changes.roles].sort(),
          stationId: changes.stationId,
        },
        clientAddress,
      },
      trx,
    );
    return true;
  });
}

/**
 * Changes a password after checking the current one; every other session of the person ends (the
 * one in `keepSessionId`, the browser that made the change, stays).
 */
export async function changePassword(
  user: SessionUser,
  currentPassword: string,
  newPassword: string,
  options: { clientAddress?: string; keepSessionId?: string | null } = {},
): Promise<{ ok: true; endedSessions: number } | { ok: false }> {
  const row = await db("users").where({ id: user.id }).first();
  if (!row || !(await bcrypt.compare(currentPassword, row.password_hash))) return { ok: false };
  const passwordHash = await hashPassword(newPassword);
  const clientAddress = options.clientAddress;
  const endedSessions = await db.transaction(async (trx) => {
    await trx("users").where({ id: user.id }).update({ password_hash: passwordHash, updated_at: trx.fn.now() });
    const ended = await endSessionsOf(user.id, { keepSessionId: options.keepSessionId, connection: trx });
    await recordAudit(
      {
        actorUserId: user.id,
        actorLabel: user.email,
        action: "password_changed",
        entityType: "user",
        entityId: user.id,
        summary: `${ended} other session${ended === 1 ? "" : "s"} ended`,
        clientAddress,
      },
      trx,
    );
    return ended;
  });
  return { ok: true, endedSessions };
}

/** An administrator's "End sessions": the person is signed out on every app server; audited. */
export async function endUserSessions(
  userId: number,
  actor: SessionUser,
  clientAddress?: string,
): Promise<{ found: false } | { found: true; ended: number }> {
  return db.transaction(async (trx) => {
    const target = await trx("users").where({ id: userId }).first("id", "email");
    if (!target) return { found: false } as const;
    const ended = await endSessionsOf(userId, { connection: trx });
    await recordAudit(
      {
        actorUserId: actor.id,
        actorLabel: actor.email,
        action: "sessions_ended",
        entityType: "user",
        entityId: userId,
        summary: `${ended} session${ended === 1 ? "" : "s"} of ${target.email} ended`,
        clientAddress,
      },
      trx,
    );
    return { found: true, ended } as const;
  });
}
