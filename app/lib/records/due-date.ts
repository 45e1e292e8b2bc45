import Holidays from "date-holidays";
import type { DueRule } from "./due-rules";

/**
 * When an answer to a public-records request is due. Pure: dates are ISO `YYYY-MM-DD` strings in
 * the agency's own zone. The day of receipt is day 0 (agency guidance pages); a request received
 * after office hours, or on a day the office is closed, counts from the next business day.
 */

export { DUE_RULE_KEYS, isDueRuleKey, RECORDS_DUE_RULES, type DueRule, type DueRuleKey } from "./due-rules";

export type BusinessCalendar = {
  /** The agency's own closure days (ISO dates). */
  closureDays?: readonly string[];
};

const federal = new Holidays("US");
const holidayCache = new Map<number, Set<string>>();

/**
 * The federal holidays of 5 U.S.C. 6103(a) as days off, with a Saturday holiday observed on the
 * Friday and a Sunday one on the Monday (5 U.S.C. 6103(b); Executive Order 11582). date-holidays
 * gives the holidays (type "public") and most observed days, but in 3.37.0 not every one (Veterans
 * Day on a Saturday has no Friday), so the observance is applied here to each holiday again.
 */
export function federalDaysOff(year: number): Set<string> {
  let days = holidayCache.get(year);
  if (!days) {
    days = new Set<string>();
    // The next year's New Year's Day may be observed on 31 December of this one.
    for (const holiday of [...federal.getHolidays(year), ...federal.getHolidays(year + 1)]) {
      if (holiday.type !== "public") continue;
      const date = holiday.date.slice(0, 10);
      const weekday = parseDate(date).getUTCDay();
      const observed = weekday === 6 ? addCalendarDays(date, -1) : weekday === 0 ? addCalendarDays(date, 1) : date;
      for (const day of [date, observed]) if (day.startsWith(String(year))) days.add(day);
    }
    holidayCache.set(year, days);
  }
  return days;
}

function parseDate(iso: string): Date {
  return new Date(`${iso}T00:00:00Z`);
}

function isoOf(date: Date): string {
  return date.toISOString().slice(0, 10);
}

export function addCalendarDays(iso: string, days: number): string {
  const date = parseDate(iso);
  date.setUTCDate(date.getUTCDate() + days);
  return isoOf(date);
}

export function isBusinessDay(iso: string, calendar: BusinessCalendar = {}): boolean {
  const weekday = parseDate(iso).getUTCDay();
  if (weekday === 0 || weekday === 6) return false;
  if (federalDaysOff(Number(iso.slice(0, 4))).has(iso)) return false;
  return !(calendar.closureDays ?? []).includes(iso);
}

/** `days` business days after `iso` (which is day 0 and is not counted). */
export function addBusinessDays(iso: string, days: number, calendar: BusinessCalendar = {}): string {
  let current = iso;
  let counted = 0;
  while (counted < days) {
    current = addCalendarDays(current, 1);
    if (isBusinessDay(current, calendar)) counted += 1;
  }
  return current;
}

/** Business days from `from` to `to` (negative when `to` is earlier); 0 on the same day. */
export function businessDaysBetween(from: string, to: string, calendar: BusinessCalendar = {}): number {
  if (from === to) return 0;
  const sign = to > from ? 1 : -1;
  let current = from;
  let counted = 0;
  while (current !== to) {
    current = addCalendarDays(current, sign);
    if (isBusinessDay(sign > 0 ? current : addCalendarDays(current, 1), calendar)) counted += sign;
  }
  return counted;
}

/**
 * Day 0 of the count: the local date of receipt, or the next business day when the request came
 * in after `officeCloses` (local `HH:MM`) or on a day the office is closed.
 */
export function countStartDate(
  localDate: string,
  localTime: string,
  officeCloses: string,
  calendar: BusinessCalendar = {},
) {
  if (isBusinessDay(localDate, calendar) && localTime < officeCloses) return localDate;
  let next = addCalendarDays(localDate, 1);
  while (!isBusinessDay(next, calendar)) next = addCalendarDays(next, 1);
  return next;
}

/** The due date under the rule, counting `extraDays` more after an extension. */
export function dueDate(countedFrom: string, rule: DueRule, calendar: BusinessCalendar = {}, extraDays = 0): string {
  const days = rule.days + extraDays;
  return rule.calendarDays ? addCalendarDays(countedFrom, days) : addBusinessDays(countedFrom, days, calendar);
}

/** Parses the closure-days setting: ISO dates separated by commas, semicolons, spaces or new lines. */
export function parseClosureDays(text: string | null | undefined): string[] {
  return (text ?? "")
    .split(/[,;\s]+/)
    .map((part) => part.trim())
    .filter((part) => /^\d{4}-\d{2}-\d{2}$/.test(part));
}
