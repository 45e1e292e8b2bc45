import { createHash } from "node:crypto";
import { RateLimiterMySQL, type RateLimiterRes } from "rate-limiter-flexible";
import { db } from "./db.server";
import { env } from "./env.server";

/**
 * Sign-in throttling that slows guessing down rather than locking the real person out. Failures
 * are counted per account, per client address and per account-and-address pair in MariaDB
 * (`sign_in_limits`), so every app server sees the same counts. After a number of free failures
 * each further failure makes the next attempt wait longer (30 s, 1, 2, 4, 8 minutes, then 15).
 * A pair that signed in before (the person's usual address) is judged by its own, looser count
 * only, so an attack on the account from elsewhere does not keep its owner out.
 *
 * Growing delays instead of lockout: OWASP Authentication Cheat Sheet, "Account lockout" (from
 * memory); the numbers are common practice, no source.
 */

export const FREE_FAILURES_PER_ACCOUNT = 5;
export const FREE_FAILURES_PER_ADDRESS = 20;
export const FREE_FAILURES_PER_KNOWN_PAIR = 10;
export const FIRST_DELAY_SECONDS = 30;
export const MAX_DELAY_SECONDS = 15 * 60;
/** Failures are forgotten a day after the first one in a run (common practice, no source). */
const FAILURE_MEMORY_SECONDS = 24 * 60 * 60;
/** A successful pair stays "usual" for 90 days (common practice, no source). */
const KNOWN_PAIR_SECONDS = 90 * 24 * 60 * 60;

/** The wait after `failures` failures when the first `free` cost nothing: doubling, capped. */
export function delayAfterFailures(failures: number, free: number): number {
  if (failures < free) return 0;
  return Math.min(MAX_DELAY_SECONDS, FIRST_DELAY_SECONDS * 2 ** (failures - free));
}

type Scope = "account" | "address" | "pair";
const FREE: Record<Scope, number> = {
  account: FREE_FAILURES_PER_ACCOUNT,
  address: FREE_FAILURES_PER_ADDRESS,
  pair: FREE_FAILURES_PER_KNOWN_PAIR,
};

type Limiters = {
  failures: Record<Scope, RateLimiterMySQL>;
  waits: Record<Scope, RateLimiterMySQL>;
  known: RateLimiterMySQL;
};
let limiters: Limiters | undefined;

function limiter(keyPrefix: string, points: number, duration: number): RateLimiterMySQL {
  return new RateLimiterMySQL({
    storeClient: db,
    storeType: "knex",
    dbName: env().DB_NAME,
    tableName: "sign_in_limits",
    // The migration makes the table; the app's database user need not create tables.
    tableCreated: true,
    clearExpiredByTimeout: true,
    keyPrefix,
    points,
    duration,
  });
}

function theLimiters(): Limiters {
  const scopes: Scope[] = ["account", "address", "pair"];
  limiters ??= {
    failures: Object.fromEntries(
      scopes.map((scope) => [scope, limiter(`fail-${scope}`, 1_000_000, FAILURE_MEMORY_SECONDS)]),
    ) as Record<Scope, RateLimiterMySQL>,
    // A wait is a block on a one-point limiter: `block(key, seconds)`, read back with `get`.
    waits: Object.fromEntries(scopes.map((scope) => [scope, limiter(`wait-${scope}`, 1, 1)])) as Record<
      Scope,
      RateLimiterMySQL
    >,
    known: limiter("known-pair", 1_000_000, KNOWN_PAIR_SECONDS),
  };
  return limiters;
}

// Keys are hashed: an email can be longer than the key column, and the table then holds no addresses.
function keyOf(...parts: string[]): string {
  return createHash("sha256").update(parts.join("\n")).digest("hex");
}

function keys(email: string, address: string): Record<Scope, string> {
  const account = email.trim().toLowerCase();
  return { account: keyOf(account), address: keyOf(address), pair: keyOf(account, address) };
}

function secondsLeft(res: RateLimiterRes | null, points: number): number {
  if (!res || res.consumedPoints <= points || res.msBeforeNext <= 0) return 0;
  return Math.ceil(res.msBeforeNext / 1000);
}

/** The scopes that judge an attempt: a usual pair has only its own count; others, account and address. */
async function scopesFor(email: string, address: string): Promise<Scope[]> {
  const known = await theLimiters().known.get(keys(email, address).pair);
  return known && known.consumedPoints > 0 ? ["pair"] : ["account", "address"];
}

/** Seconds until this account may try again from this address, or 0 when it may try now. */
export async function signInWaitSeconds(email: string, address: string): Promise<number> {
  const { waits } = theLimiters();
  const key = keys(email, address);
  const scopes = await scopesFor(email, address);
  const left = await Promise.all(scopes.map(async (scope) => secondsLeft(await waits[scope].get(key[scope]), 1)));
  return Math.max(0, ...left);
}

/** Counts a failed attempt everywhere it belongs and sets the next waits. */
export async function recordSignInFailure(email: string, address: string): Promise<void> {
  const { failures, waits } = theLimiters();
  const key = keys(email, address);
  const scopes: Scope[] = ["account", "address", "pair"];
  await Promise.all(
    scopes.map(async (scope) => {
      const counted = await failures[scope].penalty(key[scope], 1);
      const delay = delayAfterFailures(counted.consumedPoints, FREE[scope]);
      if (delay > 0) await waits[scope].block(key[scope], delay);
    }),
  );
}

/**
 * A good sign-in: the account's and the pair's runs of failures end, and the pair becomes the
 * person's usual address. The address's count stays, so one good account cannot launder guesses
 * against others.
 */
export async function recordSignInSuccess(email: string, address: string): Promise<void> {
  const { failures, waits, known } = theLimiters();
  const key = keys(email, address);
  await Promise.all([
    failures.account.delete(key.account),
    waits.account.delete(key.account),
    failures.pair.delete(key.pair),
    waits.pair.delete(key.pair),
    known.set(key.pair, 1, KNOWN_PAIR_SECONDS),
  ]);
}

/** "30 seconds", "2 minutes": the wait as the form says it. */
export function describeWait(seconds: number): string {
  if (seconds < 60) return `${seconds} second${seconds === 1 ? "" : "s"}`;
  const minutes = Math.ceil(seconds / 60);
  return `${minutes} minute${minutes === 1 ? "" : "s"}`;
}
