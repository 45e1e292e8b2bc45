import type { FleetStatus, FoamSystemStatus } from "./vocabulary";

/**
 * Due dates of a foam system's duties, as calendar dates (YYYY-MM-DD) in the agency's zone.
 * Accuracy test: every `accuracyTestIntervalMonths` after the last passing test, and at once for a
 * system never tested (an acceptance test is owed). Flush: every `flushIntervalDays` after the last
 * flush. The default intervals (12 months, 90 days) are common practice, no source.
 */

export const DEFAULT_ACCURACY_TEST_INTERVAL_MONTHS = 12;
export const DEFAULT_FLUSH_INTERVAL_DAYS = 90;
/** Reminders go to the station's officers this many days ahead, and again once overdue. */
export const REMINDER_DAYS_AHEAD = 30;

function parts(day: string): [number, number, number] {
  const [year, month, date] = day.split("-").map(Number);
  return [year, month, date];
}

function format(year: number, month: number, date: number): string {
  return `${String(year).padStart(4, "0")}-${String(month).padStart(2, "0")}-${String(date).padStart(2, "0")}`;
}

function daysInMonth(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

/** The same day `months` later; a day the month lacks becomes its last day (31 Jan + 1 → 28/29 Feb). */
export function addMonths(day: string, months: number): string {
  const [year, month, date] = parts(day);
  const index = year * 12 + (month - 1) + months;
  const toYear = Math.floor(index / 12);
  const toMonth = (index % 12) + 1;
  return format(toYear, toMonth, Math.min(date, daysInMonth(toYear, toMonth)));
}

export function addDays(day: string, days: number): string {
  const [year, month, date] = parts(day);
  const moved = new Date(Date.UTC(year, month - 1, date + days));
  return format(moved.getUTCFullYear(), moved.getUTCMonth() + 1, moved.getUTCDate());
}

/** Whole days from `from` to `to` (negative when `to` is earlier). */
export function daysBetween(from: string, to: string): number {
  const [y1, m1, d1] = parts(from);
  const [y2, m2, d2] = parts(to);
  return Math.round((Date.UTC(y2, m2 - 1, d2) - Date.UTC(y1, m1 - 1, d1)) / 86_400_000);
}

export type ScheduleFacts = {
  /** The day the system was entered (an untested system owes its test from then). */
  enteredOn: string;
  lastPassingTestOn: string | null;
  lastFlushOn: string | null;
  status: FoamSystemStatus;
};

export type ScheduleIntervals = { accuracyTestIntervalMonths: number; flushIntervalDays: number };

export type Schedule = {
  nextTestDue: string;
  nextFlushDue: string;
  status: FleetStatus;
};

export function systemSchedule(facts: ScheduleFacts, intervals: ScheduleIntervals, today: string): Schedule {
  const nextTestDue = facts.lastPassingTestOn
    ? addMonths(facts.lastPassingTestOn, intervals.accuracyTestIntervalMonths)
    : facts.enteredOn;
  const nextFlushDue = addDays(facts.lastFlushOn ?? facts.enteredOn, intervals.flushIntervalDays);
  const soonest = nextTestDue < nextFlushDue ? nextTestDue : nextFlushDue;
  const status: FleetStatus =
    facts.status === "out_of_tolerance"
      ? "out_of_tolerance"
      : soonest < today
        ? "overdue"
        : daysBetween(today, soonest) <= REMINDER_DAYS_AHEAD
          ? "due_soon"
          : "current";
  return { nextTestDue, nextFlushDue, status };
}

/** The reminder stage a due date is in today, or null when it is further off. */
export function reminderStage(dueOn: string, today: string): "due_soon" | "overdue" | null {
  if (dueOn < today) return "overdue";
  return daysBetween(today, dueOn) <= REMINDER_DAYS_AHEAD ? "due_soon" : null;
}
