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

/** Public records requests: 5 per client address per hour. */
export const RECORDS_REQUESTS_PER_HOUR = 5;

/** Seconds to wait before another try, or 0 when this one may go ahead (and is counted). */
export async function consumeRecordsRequestAllowance(clientAddress: string): Promise<number> {
  try {
    await limiter("records-request", RECORDS_REQUESTS_PER_HOUR, 3600).consume(clientAddress);
    return 0;
  } catch (error) {
    if (error instanceof RateLimiterRes) return Math.max(1, Math.ceil(error.msBeforeNext / 1000));
    throw error;
  }
}
