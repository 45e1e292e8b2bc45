import { db } from "./db.server";

export const THROTTLE_WINDOW_MINUTES = 15;
export const MAX_FAILURES_PER_ACCOUNT = 5;
export const MAX_FAILURES_PER_ADDRESS = 20;

/** Minutes until another attempt is allowed, or 0 when the account and address may try now. */
export async function signInWaitMinutes(email: string, clientAddress: string): Promise<number> {
  const since = new Date(Date.now() - THROTTLE_WINDOW_MINUTES * 60_000);
  const [byAccount, byAddress] = await Promise.all([
    failuresSince({ email }, since, true),
    failuresSince({ client_address: clientAddress }, since, false),
  ]);
  const blocking = [
    byAccount.count >= MAX_FAILURES_PER_ACCOUNT ? byAccount.oldest : null,
    byAddress.count >= MAX_FAILURES_PER_ADDRESS ? byAddress.oldest : null,
  ].filter((value): value is Date => value !== null);
  if (blocking.length === 0) return 0;
  const freedAt = Math.max(...blocking.map((oldest) => oldest.getTime() + THROTTLE_WINDOW_MINUTES * 60_000));
  return Math.max(1, Math.ceil((freedAt - Date.now()) / 60_000));
}

async function failuresSince(where: Record<string, string>, since: Date, resetBySuccess: boolean) {
  // An account's count starts again after it signs in; an address's does not, so one good account
  // cannot launder guesses against others.
  const lastSuccess = !resetBySuccess
    ? undefined
    : await db("sign_in_attempts")
        .where(where)
        .andWhere("succeeded", true)
        .andWhere("attempted_at", ">=", since)
        .max({ at: "attempted_at" })
        .first();
  const from = lastSuccess?.at ? new Date(lastSuccess.at) : since;
  const row = await db("sign_in_attempts")
    .where(where)
    .andWhere("succeeded", false)
    .andWhere("attempted_at", ">", from)
    .count({ count: "*" })
    .min({ oldest: "attempted_at" })
    .first();
  return { count: Number(row?.count ?? 0), oldest: row?.oldest ? new Date(row.oldest) : null };
}

export async function recordSignInAttempt(email: string, clientAddress: string, succeeded: boolean) {
  await db("sign_in_attempts").insert({ email, client_address: clientAddress, succeeded });
}
