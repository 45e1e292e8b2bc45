import { createHash, randomBytes } from "node:crypto";
import { createSessionStorage, type Session } from "react-router";
import { db, type Db } from "./db.server";
import { env } from "./env.server";
import { createSignedCookie } from "./signed-cookie.server";

type SessionData = { userId: number };
type SessionFlash = { flash: string };
export type AppSession = Session<SessionData, SessionFlash>;

/** Twelve hours, the length of a long shift (common practice, no source). */
export const SESSION_SECONDS = 60 * 60 * 12;

/** The cookie's id: 32 random bytes, as base64url. Only its SHA-256 is stored. */
export function newSessionId(): string {
  return randomBytes(32).toString("base64url");
}

export function sessionIdHash(id: string): string {
  return createHash("sha256").update(id).digest("hex");
}

function userIdOf(data: Partial<SessionData>): number | null {
  return typeof data.userId === "number" ? data.userId : null;
}

function expiryOf(expires: Date | undefined): Date {
  return expires ?? new Date(Date.now() + SESSION_SECONDS * 1000);
}

/** Removes sessions past their expiry, a bounded batch at a time. Returns how many went. */
export async function deleteExpiredSessions(limit = 500): Promise<number> {
  return db("sessions").where("expires_at", "<", db.fn.now(3)).limit(limit).delete();
}

let cookie: ReturnType<typeof createSignedCookie> | undefined;

/** The session cookie: signed with SESSION_SECRET, whose key is made once per process. */
export function sessionCookie() {
  cookie ??= createSignedCookie("__foamtally", {
    httpOnly: true,
    sameSite: "lax",
    path: "/",
    secure: env().COOKIE_SECURE,
    secrets: [env().SESSION_SECRET],
    maxAge: SESSION_SECONDS,
  });
  return cookie;
}

// The data versions (`data_versions`, see app/models/data-version.server.ts) ride along with the
// session's query, so a read that keeps answers per version spends no round trip of its own on them.
const dataVersionsOfRequests = new WeakMap<Request, string>();

/**
 * The `name:stamp` list of data versions read in the same query as this request's session, or
 * undefined when no session was read for it (no cookie, a bearer token, an ended session).
 */
export function dataVersionsReadWithSession(request: Request): string | undefined {
  return dataVersionsOfRequests.get(request);
}

/**
 * The person a request's session cookie names, with their roles, in one query (session, person
 * and roles together, and the data versions beside them); null for no cookie, a bad signature, or
 * an ended or expired session.
 */
export async function sessionPersonRow(request: Request): Promise<{
  id: number;
  email: string;
  name: string;
  station_id: number | null;
  active: number | boolean;
  roles: string | null;
  data_versions: string | null;
} | null> {
  const id = await sessionCookie().parse(request.headers.get("Cookie"));
  if (typeof id !== "string" || id === "") return null;
  const row = await db("sessions as s")
    .join("users as u", "u.id", "s.user_id")
    .leftJoin("user_roles as r", "r.user_id", "u.id")
    .where("s.id_hash", sessionIdHash(id))
    .andWhere("s.expires_at", ">", db.fn.now(3))
    .groupBy("u.id", "u.email", "u.name", "u.station_id", "u.active")
    .first(
      "u.id",
      "u.email",
      "u.name",
      "u.station_id",
      "u.active",
      db.raw("GROUP_CONCAT(r.role ORDER BY r.role) AS roles"),
      db.raw("(SELECT GROUP_CONCAT(name, ':', stamp) FROM data_versions) AS data_versions"),
    );
  if (!row) return null;
  dataVersionsOfRequests.set(request, String(row.data_versions ?? ""));
  return row;
}

let storage: ReturnType<typeof createSessionStorage<SessionData, SessionFlash>> | undefined;

export function sessionStorage() {
  storage ??= createSessionStorage<SessionData, SessionFlash>({
    cookie: sessionCookie(),
    async createData(data, expires) {
      const id = newSessionId();
      await db("sessions").insert({
        id_hash: sessionIdHash(id),
        user_id: userIdOf(data),
        data: JSON.stringify(data),
        expires_at: expiryOf(expires),
      });
      // Each new session sweeps a few expired ones, so the table stays small without a timer.
      await deleteExpiredSessions(50);
      return id;
    },
    async readData(id) {
      const row = await db("sessions")
        .where({ id_hash: sessionIdHash(id) })
        .andWhere("expires_at", ">", db.fn.now(3))
        .first("data");
      if (!row) return null;
      try {
        return JSON.parse(row.data) as Partial<SessionData>;
      } catch {
        return null;
      }
    },
    async updateData(id, data, expires) {
      const changed = await db("sessions")
        .where({ id_hash: sessionIdHash(id) })
        .update({ data: JSON.stringify(data), expires_at: expiryOf(expires), updated_at: db.fn.now(3) });
      // A row that was ended (sign-out, "End sessions") or swept is never brought back for a
      // signed-in person: only an anonymous one's flash message may start a fresh row under the id.
      if (changed === 0 && userIdOf(data) === null) {
        await db("sessions").insert({
          id_hash: sessionIdHash(id),
          user_id: null,
          data: JSON.stringify(data),
          expires_at: expiryOf(expires),
        });
      }
    },
    async deleteData(id) {
      if (id)
        await db("sessions")
          .where({ id_hash: sessionIdHash(id) })
          .delete();
    },
  });
  return storage;
}

export async function getSession(request: Request): Promise<AppSession> {
  return sessionStorage().getSession(request.headers.get("Cookie"));
}

export async function commitSession(session: AppSession) {
  return sessionStorage().commitSession(session);
}

export async function destroySession(session: AppSession) {
  return sessionStorage().destroySession(session);
}

/**
 * A new session for a person who has just signed in. The id the browser had before is dropped, so
 * an id planted before sign-in (session fixation) never becomes a signed-in one.
 */
export async function startSession(request: Request, userId: number): Promise<string> {
  const previous = await getSession(request);
  if (previous.id)
    await db("sessions")
      .where({ id_hash: sessionIdHash(previous.id) })
      .delete();
  const session = await sessionStorage().getSession();
  session.set("userId", userId);
  return commitSession(session);
}

/** The id of the session the request came with, if any (to keep it when ending the others). */
export async function currentSessionId(request: Request): Promise<string | null> {
  const session = await getSession(request);
  return session.id || null;
}

/**
 * Ends a person's sessions on every app server at once, except `keepSessionId` when given (the
 * browser that changed its own password stays signed in). Returns how many ended.
 */
export async function endSessionsOf(
  userId: number,
  options: { keepSessionId?: string | null; connection?: Db } = {},
): Promise<number> {
  const query = (options.connection ?? db)("sessions").where({ user_id: userId });
  if (options.keepSessionId) query.whereNot({ id_hash: sessionIdHash(options.keepSessionId) });
  return query.delete();
}

/** How many unexpired sessions each person has, for the people page. */
export async function activeSessionCounts(): Promise<Map<number, number>> {
  const rows: { user_id: number; n: number | string }[] = await db("sessions")
    .whereNotNull("user_id")
    .andWhere("expires_at", ">", db.fn.now(3))
    .groupBy("user_id")
    .select("user_id", db.raw("COUNT(*) AS n"));
  return new Map(rows.map((row) => [Number(row.user_id), Number(row.n)]));
}

/** Headers that carry a one-time message to the next page. */
export async function flashHeaders(request: Request, message: string): Promise<HeadersInit> {
  const session = await getSession(request);
  session.flash("flash", message);
  return { "Set-Cookie": await commitSession(session) };
}
