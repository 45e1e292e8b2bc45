// InnoDB resolves a deadlock by rolling one transaction back whole and telling it to try again
// (error 1213, ER_LOCK_DEADLOCK: "Deadlock found when trying to get lock; try restarting
// transaction", MariaDB's error-code reference). A transaction that can simply run again is retried.
const ER_LOCK_DEADLOCK = 1213;

export function isDeadlock(error: unknown): boolean {
  return (error as { errno?: number } | null)?.errno === ER_LOCK_DEADLOCK;
}

/**
 * Runs `transaction` (a whole transaction, safe to run again from the start) and, when the database
 * chose it as a deadlock's victim, runs it again after a short random pause, up to `attempts` times.
 */
export async function retryingDeadlocks<T>(transaction: () => Promise<T>, attempts = 4): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await transaction();
    } catch (error) {
      if (!isDeadlock(error) || attempt >= attempts) throw error;
      await new Promise((resolve) => setTimeout(resolve, Math.random() * 20 * attempt));
    }
  }
}
