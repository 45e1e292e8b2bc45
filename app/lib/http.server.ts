import { data } from "react-router";
import { recordIdOf } from "./record-id";

/** The one way a loader or action stops with a status and a message a person can act on. */
export function httpError(status: number, message: string): never {
  throw data({ message }, { status });
}

export function invariantResponse(condition: unknown, message: string, status = 404): asserts condition {
  if (!condition) httpError(status, message);
}

/** Errors for `/api/*` routes: always JSON, never a page. */
export function apiError(status: number, message: string, extra: Record<string, unknown> = {}): never {
  throw Response.json({ error: message, ...extra }, { status });
}

export function isApiRequest(request: Request): boolean {
  return new URL(request.url).pathname.startsWith("/api/");
}

const DATABASE_DOWN_CODES = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "ETIMEDOUT",
  "PROTOCOL_CONNECTION_LOST",
  "ER_CON_COUNT_ERROR",
  "ER_ACCESS_DENIED_ERROR",
]);

export function isDatabaseDown(error: unknown): boolean {
  if (!error || typeof error !== "object") return false;
  if (isDatabaseDownResponse(error)) return true;
  const code = (error as { code?: unknown }).code;
  const name = (error as { name?: unknown }).name;
  const down = (typeof code === "string" && DATABASE_DOWN_CODES.has(code)) || name === "KnexTimeoutError";
  if (down) console.warn(`Database not answering (${String(code ?? name)}): ${(error as Error).message}`);
  return down;
}

export const DATABASE_DOWN_MESSAGE =
  "The records database is not answering right now. Nothing was lost or half-saved; please try again in a minute.";

/**
 * The 503 a database outage becomes (`app/lib/db.server.ts` throws it from any query): `message`
 * for the error page, `error` for `/api/*` JSON.
 */
export function databaseDownResponse() {
  return data({ message: DATABASE_DOWN_MESSAGE, error: DATABASE_DOWN_MESSAGE }, { status: 503 });
}

/** Whether a thrown value is the 503 of a database outage. */
export function isDatabaseDownResponse(thrown: unknown): boolean {
  const value = thrown as { init?: { status?: number }; data?: { message?: string } } | null;
  return value?.init?.status === 503 && value.data?.message === DATABASE_DOWN_MESSAGE;
}

/** Turns a database outage into a clear 503 for pages and APIs alike; rethrows anything else. */
export function rethrowDatabaseDown(request: Request, error: unknown): never {
  if (isDatabaseDown(error) || isDatabaseDownResponse(error)) {
    if (isApiRequest(request)) apiError(503, DATABASE_DOWN_MESSAGE);
    httpError(503, DATABASE_DOWN_MESSAGE);
  }
  throw error;
}

export function clientAddress(request: Request): string {
  return request.headers.get("x-foamtally-client-address") ?? "unknown";
}

/**
 * The record id an address names (`params.id`), or a 404 before any query: JSON for `/api/*`, the
 * error page otherwise.
 */
export function requireRecordId(request: Request, value: string | undefined, message: string): number {
  const id = recordIdOf(value);
  if (id != null) return id;
  if (isApiRequest(request)) apiError(404, message);
  httpError(404, message);
}

/**
 * A JSON response that declares its length, so the server's compression leaves bodies under its
 * 1 KB threshold alone (a small answer costs more to compress than to send).
 */
export function jsonResponse(body: unknown, init: ResponseInit = {}): Response {
  const bytes = Buffer.from(JSON.stringify(body), "utf8");
  const headers = new Headers(init.headers);
  headers.set("Content-Type", "application/json; charset=utf-8");
  headers.set("Content-Length", String(bytes.byteLength));
  return new Response(bytes, { ...init, headers });
}
