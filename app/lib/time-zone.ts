/**
 * Instants are stored in UTC; people type and read the agency's wall-clock time ("YYYY-MM-DDTHH:MM",
 * as a datetime-local field gives it). These convert between the two with the platform's time-zone
 * data (Intl), daylight-saving changes included.
 */

const formatters = new Map<string, Intl.DateTimeFormat>();

/** One formatter per zone: making one costs far more than using it, and exports convert every row. */
function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let format = formatters.get(timeZone);
  if (!format) {
    format = new Intl.DateTimeFormat("en-US", {
      timeZone,
      hourCycle: "h23",
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
      second: "2-digit",
    });
    formatters.set(timeZone, format);
  }
  return format;
}

/** Offset of `timeZone` from UTC at `instant`, in minutes (positive east of Greenwich). */
export function zoneOffsetMinutes(instant: Date, timeZone: string): number {
  const parts = formatterFor(timeZone).formatToParts(instant);
  const get = (type: string) => Number(parts.find((part) => part.type === type)?.value);
  const asUtc = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"), get("second"));
  return Math.round((asUtc - instant.getTime()) / 60_000);
}

const WALL_CLOCK = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2}))?$/;
const CALENDAR_DAY = /^(\d{4})-(\d{2})-(\d{2})$/;

/**
 * The years a record's dates may fall in. `Date.UTC` reads years 0–99 as 1900–1999, and MariaDB's
 * DATE and DATETIME columns end at 9999-12-31, which a late hour west of Greenwich passes once it
 * is turned into UTC; no record of foam use is older than 1900 or centuries ahead.
 */
export const RECORD_YEARS = { first: 1900, last: 2199 } as const;

function isDayOfCalendar(year: number, month: number, day: number): boolean {
  if (year < RECORD_YEARS.first || year > RECORD_YEARS.last || month < 1 || month > 12 || day < 1) return false;
  // Day 0 of the next month is the last day of this one.
  return day <= new Date(Date.UTC(year, month, 0)).getUTCDate();
}

/** Whether "YYYY-MM-DD" is a day the calendar has (not 30 February) within `RECORD_YEARS`. */
export function isCalendarDay(text: string): boolean {
  const match = CALENDAR_DAY.exec(text);
  return match !== null && isDayOfCalendar(Number(match[1]), Number(match[2]), Number(match[3]));
}

/** Whether "YYYY-MM-DDTHH:MM" (seconds optional) is a time of a calendar day within `RECORD_YEARS`. */
export function isWallClock(text: string): boolean {
  const match = WALL_CLOCK.exec(text);
  if (!match) return false;
  const [, year, month, day, hour, minute, second] = match.map(Number);
  return isDayOfCalendar(year, month, day) && hour <= 23 && minute <= 59 && (second || 0) <= 59;
}

/**
 * The instant at which the agency's clocks showed `wallClock`, or null for text that is not a time
 * of a calendar day (`isWallClock`): 30 February is refused, never read as 2 March.
 */
export function wallClockToInstant(wallClock: string | null | undefined, timeZone: string): Date | null {
  const match = wallClock && isWallClock(wallClock) ? WALL_CLOCK.exec(wallClock) : null;
  if (!match) return null;
  const [, year, month, day, hour, minute, second] = match.map(Number);
  const guess = Date.UTC(year, month - 1, day, hour, minute, second || 0);
  let instant = guess - zoneOffsetMinutes(new Date(guess), timeZone) * 60_000;
  // Once more, in case the first guess fell on the other side of a daylight-saving change.
  instant = guess - zoneOffsetMinutes(new Date(instant), timeZone) * 60_000;
  return new Date(instant);
}

const HOUR = 3_600_000;
const offsetsPerHour = new Map<string, Map<number, number | null>>();

/**
 * `zoneOffsetMinutes`, with the offset kept per zone and UTC hour: lists and exports convert every
 * row, and asking Intl costs far more than the arithmetic. An hour is kept only when its first and
 * last millisecond have the same offset, so an hour with a change in it (at :30 in a zone such as
 * America/St_Johns) is asked per instant.
 */
export function keptZoneOffsetMinutes(instant: Date, timeZone: string): number {
  let perHour = offsetsPerHour.get(timeZone);
  if (!perHour) offsetsPerHour.set(timeZone, (perHour = new Map()));
  const hour = Math.floor(instant.getTime() / HOUR);
  let offset = perHour.get(hour);
  if (offset === undefined) {
    const first = zoneOffsetMinutes(new Date(hour * HOUR), timeZone);
    const last = zoneOffsetMinutes(new Date(hour * HOUR + HOUR - 1), timeZone);
    offset = first === last ? first : null;
    if (perHour.size >= 100_000) perHour.clear();
    perHour.set(hour, offset);
  }
  return offset ?? zoneOffsetMinutes(instant, timeZone);
}

/** How the agency's clocks showed `instant`, as "YYYY-MM-DDTHH:MM"; "" for no instant. */
export function instantToWallClock(instant: Date | string | null | undefined, timeZone: string): string {
  if (!instant) return "";
  const date = instant instanceof Date ? instant : new Date(instant);
  if (Number.isNaN(date.getTime())) return "";
  const shifted = new Date(date.getTime() + keptZoneOffsetMinutes(date, timeZone) * 60_000);
  return shifted.toISOString().slice(0, 16);
}

/** The UTC instant of local midnight at the start of `day` ("YYYY-MM-DD") in `timeZone`. */
export function startOfLocalDay(day: string, timeZone: string): Date {
  const instant = wallClockToInstant(`${day}T00:00`, timeZone);
  if (!instant) throw new RangeError(`Not a day: ${day}`);
  return instant;
}

/** The first instant after `day` ("YYYY-MM-DD") in `timeZone`: local midnight of the next day, as UTC. */
export function endOfLocalDay(day: string, timeZone: string): Date {
  const next = new Date(`${day}T00:00:00Z`);
  next.setUTCDate(next.getUTCDate() + 1);
  return startOfLocalDay(next.toISOString().slice(0, 10), timeZone);
}

/** How the agency's clocks showed `instant`, as "YYYY-MM-DD HH:MM" for a page, a mail or a file. */
export function localDateTime(instant: Date, timeZone: string): string {
  return instantToWallClock(instant, timeZone).replace("T", " ");
}

/**
 * A converter from instants to the agency's wall-clock time, as a Date whose UTC fields hold the
 * local date and time to the second: spreadsheet cells have no time zone, so they show these fields
 * as they are.
 */
export function wallClockIn(timeZone: string): (instant: Date | null) => Date | null {
  return (instant) => {
    if (!instant) return null;
    const shifted = instant.getTime() + keptZoneOffsetMinutes(instant, timeZone) * 60_000;
    return new Date(Math.floor(shifted / 1000) * 1000);
  };
}

/**
 * An instant as people of the agency read it: their own date and clock, with the zone's short name,
 * e.g. "Mar 8, 2026, 3:10 AM CDT" in America/Chicago.
 */
export function formatInstantInZone(instant: Date | string, timeZone: string): string {
  return new Date(instant).toLocaleString("en-US", {
    timeZone,
    year: "numeric",
    month: "short",
    day: "numeric",
    hour: "numeric",
    minute: "2-digit",
    timeZoneName: "short",
  });
}
