import { RateLimiterMySQL, RateLimiterRes } from "rate-limiter-flexible";
import { db } from "./db.server";
import { env } from "./env.server";

/**
 * Limits kept in MariaDB (the `rate_limits` table), so that every app server counts against the
 * same budget. The figures are the product's own starting points (common practice, no source).
 */
const limiters = new Map<string, RateLimiterMySQL>();

function limiter(name: string, points: number, durationSeconds: number): RateLimiterMySQL {
  let found = limiters.get(name);
  if (!found) {
    found = new RateLimiterMySQL({
      storeClient: db,
      storeType: "knex",
      dbName: env().DB_NAME,
      tableName: "rate_limits",
      tableCreated: true,
      keyPrefix: name,
      points,
      duration: durationSeconds,
      clearExpiredByTimeout: false,
    });
    limiters.set(name, found);
  }
  return found;
}

/** Seconds to wait before another try under this limit, or 0 when this one may go ahead (and is counted). */
async function consume(name: string, points: number, durationSeconds: number, key: string): Promise<number> {
  try {
    await limiter(name, points, durationSeconds).consume(key);
    return 0;
  } catch (error) {
    if (error instanceof RateLimiterRes) return Math.max(1, Math.ceil(error.msBeforeNext / 1000));
    throw error;
  }
}

/** Password-reset requests: 10 per client address and 3 per e-mail address per hour. */
export const PASSWORD_RESETS_PER_ADDRESS_PER_HOUR = 10;
export const PASSWORD_RESETS_PER_EMAIL_PER_HOUR = 3;

/**
 * Whether a reset request may go ahead: `waitSeconds` > 0 when this client address asked too often
 * (the page says so); `mayMail` false when this e-mail address was sent enough links this hour (the
 * page says nothing different, so that it tells no one whether the address is known).
 */
export async function consumePasswordResetAllowance(
  clientAddress: string,
  email: string,
): Promise<{ waitSeconds: number; mayMail: boolean }> {
  const waitSeconds = await consume(
    "password-reset-address",
    PASSWORD_RESETS_PER_ADDRESS_PER_HOUR,
    3600,
    clientAddress,
  );
  if (waitSeconds > 0) return { waitSeconds, mayMail: false };
  const emailWait = await consume("password-reset-email", PASSWORD_RESETS_PER_EMAIL_PER_HOUR, 3600, email);
  return { waitSeconds: 0, mayMail: emailWait === 0 };
}

/** Public records requests: 5 per client address per hour. */
export const RECORDS_REQUESTS_PER_HOUR = 5;

/** Seconds to wait before another try, or 0 when this one may go ahead (and is counted). */
export function consumeRecordsRequestAllowance(clientAddress: string): Promise<number> {
  return consume("records-request", RECORDS_REQUESTS_PER_HOUR, 3600, clientAddress);
}
