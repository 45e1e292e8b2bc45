import { db } from "~/lib/db.server";
import { queueFoamSystemReminders } from "./foam-system-reminders.server";
import { queueStockAlerts } from "./stock-alerts.server";

/**
 * What falls due with time alone, with no one saving or opening anything: foam-system tests and
 * flushes, lots past their shelf life or due for a quality sample. Each check claims what it sends,
 * so several app servers running this queue each mail once.
 */
export async function runScheduledChecks(now = new Date()): Promise<{ reminders: number; stockAlerts: number }> {
  const reminders = await queueFoamSystemReminders(now);
  const stockAlerts = await db.transaction((trx) => queueStockAlerts(trx));
  return { reminders, stockAlerts };
}

let timer: ReturnType<typeof setInterval> | undefined;

/** The server process's scheduled checks: shortly after start, then hourly; started once by scripts/serve.js. */
export function startScheduledChecks(intervalMs = 60 * 60_000): void {
  if (timer) return;
  const run = () => {
    runScheduledChecks().catch((error: unknown) => {
      console.warn(`Scheduled checks will be tried again: ${error instanceof Error ? error.message : String(error)}`);
    });
  };
  timer = setInterval(run, intervalMs);
  timer.unref();
  setTimeout(run, 5_000).unref();
}
