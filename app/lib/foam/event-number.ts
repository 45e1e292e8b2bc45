import type { EventKind } from "./vocabulary";

/**
 * The one rule for generated event numbers, used by the report form's save and by the demo seed:
 * `<series>-<year>-<sequence>`, e.g. AB-2026-0042. Incidents carry the agency's own prefix (an agency
 * setting); training, tests and flushes have fixed series so they never mix with dispatch numbers.
 * The year is the agency's calendar year of the event's start. The sequence is allocated in the
 * database, one counter row per series and year (`app/models/event-number.server.ts`).
 */

/** The agency prefix when none is set: the demo district's (Alder Bend). */
export const DEFAULT_EVENT_NUMBER_PREFIX = "AB";

/** One letter, then up to five letters or digits: short enough for a 32-character number. */
export const EVENT_NUMBER_PREFIX_PATTERN = /^[A-Z][A-Z0-9]{0,5}$/;

/** Series of the kinds that are not incidents. */
const FIXED_SERIES: Record<Exclude<EventKind, "incident">, string> = {
  training: "TR",
  test: "PT",
  flush: "FL",
};

/** Series a kind's numbers are counted in. */
export function eventNumberSeries(kind: EventKind, agencyPrefix: string): string {
  return kind === "incident" ? agencyPrefix || DEFAULT_EVENT_NUMBER_PREFIX : FIXED_SERIES[kind];
}

/** Whether an agency prefix would collide with a fixed series (numbers of two kinds would mix). */
export function isReservedPrefix(prefix: string): boolean {
  return (Object.values(FIXED_SERIES) as string[]).includes(prefix);
}

export function formatEventNumber(series: string, year: number, sequence: number): string {
  return `${series}-${year}-${String(sequence).padStart(4, "0")}`;
}

/** The stem every number of a series and year starts with. */
export function eventNumberStem(series: string, year: number): string {
  return `${series}-${year}-`;
}

/** The sequence of a number in a series and year, or null when it is not one of them. */
export function sequenceOf(number: string, series: string, year: number): number | null {
  const stem = eventNumberStem(series, year);
  if (!number.startsWith(stem)) return null;
  const rest = number.slice(stem.length);
  return /^\d{1,9}$/.test(rest) ? Number(rest) : null;
}
