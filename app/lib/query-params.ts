import { recordIdOf } from "./record-id";
import { isCalendarDay } from "./time-zone";

/**
 * The one reader of a query string's filters. Each kind of parameter has one strict reading: a
 * record id as in addresses (`recordIdOf`: digits only, no sign, exponent or hex), a day the
 * calendar has (`isCalendarDay`), one word of a list, a whole number in a range. A value that
 * fails its reading is left out and its problem noted under the parameter's name, so that a page
 * shows its unfiltered (or default) list with the note, and a download or `/api/*` route answers
 * 400 with the problems by field. An empty value means the filter is not set.
 */

/** Problems of a query, by parameter name: one sentence each that a person can act on. */
export type QueryProblems = Record<string, string>;

export type QueryReader = {
  problems: QueryProblems;
  /** A record id (`station=12`); anything else is a problem. */
  recordId(name: string, what: string): number | undefined;
  /** A calendar day, YYYY-MM-DD. */
  day(name: string): string | undefined;
  /** One of the allowed words. */
  choice<T extends string>(name: string, allowed: readonly T[]): T | undefined;
  /** A whole number from `min` to `max`, written in digits. */
  wholeNumber(name: string, range: { min?: number; max: number }): number | undefined;
  /** A number in decimal digits (`-93.25`, `45`; no exponent, hex or spaces) from `min` to `max`. */
  decimal(name: string, range: { min: number; max: number }, problem: string): number | undefined;
  /** Free text of at most `max` characters, trimmed. */
  text(name: string, max: number, what: string): string | undefined;
};

const DIGITS = /^\d{1,16}$/;
const DECIMAL = /^[+-]?(?:\d{1,16}(?:\.\d{0,16})?|\.\d{1,16})$/;

export function queryReader(search: URLSearchParams): QueryReader {
  const problems: QueryProblems = {};
  const valueOf = (name: string) => search.get(name) ?? "";
  return {
    problems,
    recordId(name, what) {
      const value = valueOf(name);
      if (!value) return undefined;
      const id = recordIdOf(value);
      if (id === null) problems[name] = `Use ${what} from the list (a record id, a whole number).`;
      return id ?? undefined;
    },
    day(name) {
      const value = valueOf(name);
      if (!value) return undefined;
      if (!isCalendarDay(value)) {
        problems[name] = "Use a date like 2026-03-31.";
        return undefined;
      }
      return value;
    },
    choice(name, allowed) {
      const value = valueOf(name);
      if (!value) return undefined;
      if (!(allowed as readonly string[]).includes(value)) {
        problems[name] = `Use one of: ${allowed.join(", ")}.`;
        return undefined;
      }
      return value as (typeof allowed)[number];
    },
    wholeNumber(name, { min = 1, max }) {
      const value = valueOf(name);
      if (!value) return undefined;
      const number = DIGITS.test(value) ? Number(value) : Number.NaN;
      if (!(number >= min && number <= max)) {
        problems[name] = `Use a whole number from ${min} to ${max}.`;
        return undefined;
      }
      return number;
    },
    decimal(name, { min, max }, problem) {
      const value = valueOf(name);
      if (!value) return undefined;
      const number = DECIMAL.test(value) ? Number(value) : Number.NaN;
      if (!(number >= min && number <= max)) {
        problems[name] = problem;
        return undefined;
      }
      return number;
    },
    text(name, max, what) {
      const value = valueOf(name).trim();
      if (!value) return undefined;
      if (value.length > max) {
        problems[name] = `${what} has at most ${max} characters.`;
        return undefined;
      }
      return value;
    },
  };
}

/** The sentence a page shows above a list whose address carried filters it could not use. */
export function ignoredFiltersNote(problems: QueryProblems): string | null {
  const names = Object.keys(problems);
  if (!names.length) return null;
  return `Not filtered by ${names.join(", ")}: ${names.map((name) => problems[name]).join(" ")}`;
}
