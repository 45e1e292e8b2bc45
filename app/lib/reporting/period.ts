import { endOfLocalDay, localDateTime, startOfLocalDay } from "../time-zone";
/** A reporting period: calendar days in the agency's time zone, first and last day inclusive. */
export type ReportPeriod = {
  from: string;
  to: string;
  label: string;
  year: number | null;
  quarter: number | null;
  /** First instant of `from` in the agency's zone, as UTC. */
  startUtc: Date;
  /** First instant after `to` in the agency's zone, as UTC (exclusive bound). */
  endUtc: Date;
};

export type PeriodResult = { ok: true; period: ReportPeriod } | { ok: false; message: string };

export const MAX_PERIOD_DAYS = 731;
const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

function isoDay(year: number, month: number, day: number): string {
  return `${String(year).padStart(4, "0")}-${String(month).padStart(2, "0")}-${String(day).padStart(2, "0")}`;
}

function validDate(value: string): boolean {
  const match = ISO_DATE.exec(value);
  if (!match) return false;
  const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])];
  const date = new Date(Date.UTC(year, month - 1, day));
  return date.getUTCFullYear() === year && date.getUTCMonth() === month - 1 && date.getUTCDate() === day;
}

export function quarterDays(year: number, quarter: number): { from: string; to: string } {
  const firstMonth = (quarter - 1) * 3 + 1;
  const lastDay = new Date(Date.UTC(year, firstMonth + 2, 0)).getUTCDate();
  return { from: isoDay(year, firstMonth, 1), to: isoDay(year, firstMonth + 2, lastDay) };
}

/**
 * Reads `year` + `quarter`, or `from` + `to` (ISO dates, inclusive), from query parameters.
 * Every refusal carries a sentence a person can act on.
 */
export function parseReportPeriod(params: URLSearchParams, timeZone: string): PeriodResult {
  const year = params.get("year");
  const quarter = params.get("quarter");
  const from = params.get("from");
  const to = params.get("to");
  let days: { from: string; to: string };
  let label: string;
  let yearNumber: number | null = null;
  let quarterNumber: number | null = null;
  if (year !== null || quarter !== null) {
    if (from !== null || to !== null)
      return { ok: false, message: "Give either a year and quarter, or from and to dates, not both." };
    if (!year || !/^\d{4}$/.test(year) || Number(year) < 2000 || Number(year) > 2100) {
      return { ok: false, message: "The year must be a four-digit year between 2000 and 2100." };
    }
    if (!quarter || !/^[1-4]$/.test(quarter)) return { ok: false, message: "The quarter must be 1, 2, 3 or 4." };
    yearNumber = Number(year);
    quarterNumber = Number(quarter);
    days = quarterDays(yearNumber, quarterNumber);
    label = `${yearNumber} Q${quarterNumber}`;
  } else if (from !== null || to !== null) {
    if (!from || !validDate(from))
      return { ok: false, message: "The from date must be a real date written YYYY-MM-DD." };
    if (!to || !validDate(to)) return { ok: false, message: "The to date must be a real date written YYYY-MM-DD." };
    if (to < from) return { ok: false, message: "The to date must be on or after the from date." };
    const span = (Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000 + 1;
    if (span > MAX_PERIOD_DAYS) return { ok: false, message: `A period may cover at most ${MAX_PERIOD_DAYS} days.` };
    days = { from, to };
    label = `${from} to ${to}`;
  } else {
    return { ok: false, message: "Choose a year and quarter, or from and to dates." };
  }
  return {
    ok: true,
    period: {
      ...days,
      label,
      year: yearNumber,
      quarter: quarterNumber,
      startUtc: startOfLocalDay(days.from, timeZone),
      endUtc: endOfLocalDay(days.to, timeZone),
    },
  };
}

export function periodQuery(period: Pick<ReportPeriod, "from" | "to" | "year" | "quarter">): string {
  return period.year !== null && period.quarter !== null
    ? `year=${period.year}&quarter=${period.quarter}`
    : `from=${period.from}&to=${period.to}`;
}

/** The query of the last quarter that has fully ended at `now` in the agency's time zone. */
export function lastCompleteQuarter(now: Date, timeZone: string): URLSearchParams {
  const [year, month] = localDateTime(now, timeZone).split("-").map(Number);
  const current = Math.floor((month - 1) / 3) + 1;
  return current === 1
    ? new URLSearchParams({ year: String(year - 1), quarter: "4" })
    : new URLSearchParams({ year: String(year), quarter: String(current - 1) });
}
