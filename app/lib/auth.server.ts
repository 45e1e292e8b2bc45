import { createHash } from "node:crypto";
import bcrypt from "bcryptjs";
import { redirect } from "react-router";
import { Authenticator } from "remix-auth";
import { FormStrategy } from "remix-auth-form";
import { recordAudit } from "./audit.server";
import { db } from "./db.server";
import { apiError, clientAddress, isApiRequest, rethrowDatabaseDown } from "./http.server";
import { acceptsApiToken, isRole, type Principal, type Role } from "./access";
import { sessionPersonRow } from "./session.server";
import { MAX_PASSWORD_BYTES, passwordBytes } from "./password-rules";
import { SignInFormSchema } from "./sign-in-form";
import { describeWait, recordSignInFailure, recordSignInSuccess, signInWaitSeconds } from "./sign-in-throttle.server";

export type SessionUser = Principal & { email: string; name: string; roles: Role[] };

export const PASSWORD_COST = 12;
export const SIGN_IN_FAILED = "The email or password is incorrect.";

export class SignInError extends Error {
  constructor(
    message: string,
    readonly status = 400,
    /** Seconds before another attempt is worth making (sent as Retry-After with a 429). */
    readonly retryAfterSeconds: number | null = null,
  ) {
    super(message);
  }
}

/** bcrypt reads only the first 72 bytes, so a longer password is refused, never shortened (decision 022). */
export function hashPassword(password: string): Promise<string> {
  if (passwordBytes(password) > MAX_PASSWORD_BYTES) throw new Error("A password has at most 72 bytes.");
  return bcrypt.hash(password, PASSWORD_COST);
}

async function loadUser(
  where: { "users.id": number } | { "users.email": string },
): Promise<(SessionUser & { active: boolean; passwordHash: string }) | null> {
  const row = await db("users").where(where).first();
  if (!row) return null;
  const roles = await db("user_roles").where({ user_id: row.id }).pluck("role");
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    roles: roles.filter(isRole),
    stationId: row.station_id ?? null,
    active: Boolean(row.active),
    passwordHash: row.password_hash,
  };
}

function sessionUserOf(user: SessionUser): SessionUser {
  return { id: user.id, email: user.email, name: user.name, roles: user.roles, stationId: user.stationId };
}

// A real hash of a random string, compared against when the email is unknown so that the time taken
// does not reveal which accounts exist.
const UNKNOWN_USER_HASH = "$2b$12$7o80WsQEliveu/MAPwq3R..nX65OI.AgcOWzddKzqpYIqe6kZTVvm";

export const authenticator = new Authenticator<SessionUser>();

authenticator.use(
  new FormStrategy(async ({ form, request }) => {
    const parsed = SignInFormSchema.safeParse(Object.fromEntries(form));
    if (!parsed.success) throw new SignInError(SIGN_IN_FAILED);
    const { email, password } = parsed.data;
    const address = clientAddress(request);
    const wait = await signInWaitSeconds(email, address);
    if (wait > 0) {
      throw new SignInError(
        `Too many failed sign-ins for this account or address. Wait ${describeWait(wait)}, then try again.`,
        429,
        wait,
      );
    }
    const user = await loadUser({ "users.email": email });
    const matches = await bcrypt.compare(password, user?.passwordHash ?? UNKNOWN_USER_HASH);
    if (!user || !matches || !user.active) {
      await recordSignInFailure(email, address);
      await recordAudit({
        actorUserId: user?.id ?? null,
        actorLabel: email,
        action: "sign_in_failed",
        entityType: "user",
        entityId: user?.id ?? null,
        summary: !user ? "unknown email" : !matches ? "wrong password" : "deactivated account",
        clientAddress: address,
      });
      throw new SignInError(SIGN_IN_FAILED);
    }
    await recordSignInSuccess(email, address);
    await recordAudit({
      actorUserId: user.id,
      actorLabel: user.email,
      action: "sign_in",
      entityType: "user",
      entityId: user.id,
      clientAddress: address,
    });
    return sessionUserOf(user);
  }),
  "form",
);

export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

async function userFromBearer(request: Request): Promise<SessionUser | null> {
  const header = request.headers.get("Authorization");
  const match = header?.match(/^Bearer\s+(\S+)$/i);
  if (!match) return null;
  const token = await db("api_tokens")
    .where({ token_hash: hashToken(match[1]) })
    .whereNull("revoked_at")
    .first();
  if (!token) return null;
  const user = await loadUser({ "users.id": token.user_id });
  if (!user || !user.active) return null;
  await db("api_tokens").where({ id: token.id }).update({ last_used_at: db.fn.now() });
  return sessionUserOf(user);
}

async function userFromSession(request: Request): Promise<SessionUser | null> {
  const row = await sessionPersonRow(request);
  if (!row || !row.active) return null;
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    roles: String(row.roles ?? "")
      .split(",")
      .filter(isRole),
    stationId: row.station_id ?? null,
  };
}

// A page's root loader and its route loader both ask who is signed in; a GET asks the database
// once. Actions ask afresh, since they may change the answer (sign-out, roles) before loaders run.
const usersOfReads = new WeakMap<Request, Promise<SessionUser | null>>();

/**
 * The signed-in person, or null. Never throws for a bad cookie. A bearer token counts on `/api/*`
 * only: it never signs into a page, a download or a form action.
 */
export function getUser(request: Request): Promise<SessionUser | null> {
  if (request.method !== "GET" && request.method !== "HEAD") return readUser(request);
  let user = usersOfReads.get(request);
  if (!user) {
    user = readUser(request);
    usersOfReads.set(request, user);
  }
  return user;
}

async function readUser(request: Request): Promise<SessionUser | null> {
  try {
    if (acceptsApiToken(new URL(request.url).pathname) && request.headers.has("Authorization")) {
      return await userFromBearer(request);
    }
    return await userFromSession(request);
  } catch (error) {
    rethrowDatabaseDown(request, error);
  }
}

/**
 * Any signed-in person. Pages redirect to sign-in; `/api/*` answers 401 JSON. Guards that need a
 * role call `requireCapability` (`access.server.ts`), which starts here.
 */
export async function requireUser(request: Request): Promise<SessionUser> {
  const user = await getUser(request);
  if (user) return user;
  if (isApiRequest(request)) apiError(401, "Sign in, or send a valid API token as 'Authorization: Bearer <token>'.");
  const url = new URL(request.url);
  throw redirect(`/sign-in?redirectTo=${encodeURIComponent(url.pathname + url.search)}`);
}

export { safeRedirectTo } from "./safe-redirect";
