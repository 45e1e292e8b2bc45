import { describe, expect, it } from "vitest";
import { startOfLocalDay } from "../time-zone";
import { lastCompleteQuarter, parseReportPeriod } from "./period";

const parse = (query: string) => parseReportPeriod(new URLSearchParams(query), "America/Chicago");

describe("report periods", () => {
  it("turns a quarter into its calendar days and the agency's local midnights", () => {
    const result = parse("year=2026&quarter=3");
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.period).toMatchObject({ from: "2026-07-01", to: "2026-09-30", label: "2026 Q3" });
    // Chicago is on daylight time (UTC−5) on both 1 July and 1 October 2026.
    expect(result.period.startUtc.toISOString()).toBe("2026-07-01T05:00:00.000Z");
    expect(result.period.endUtc.toISOString()).toBe("2026-10-01T05:00:00.000Z");
  });

  it("handles a quarter that starts in standard time and ends in daylight time", () => {
    const result = parse("year=2026&quarter=1");
    if (!result.ok) throw new Error(result.message);
    expect(result.period.startUtc.toISOString()).toBe("2026-01-01T06:00:00.000Z");
    expect(result.period.endUtc.toISOString()).toBe("2026-04-01T05:00:00.000Z");
    expect(startOfLocalDay("2026-03-08", "America/Chicago").toISOString()).toBe("2026-03-08T06:00:00.000Z");
  });

  it("accepts an inclusive date range", () => {
    const result = parse("from=2026-02-01&to=2026-02-28");
    if (!result.ok) throw new Error(result.message);
    expect(result.period.endUtc.toISOString()).toBe("2026-03-01T06:00:00.000Z");
  });

  it.each([
    ["", /Choose a year and quarter/],
    ["year=2026&quarter=5", /quarter must be 1, 2, 3 or 4/],
    ["year=26&quarter=1", /four-digit year/],
    ["year=2026", /quarter must be/],
    ["from=2026-02-30&to=2026-03-01", /from date must be a real date/],
    ["from=2026-03-01&to=2026-02-01", /on or after/],
    ["from=2020-01-01&to=2026-01-01", /at most 731 days/],
    ["year=2026&quarter=1&from=2026-01-01", /not both/],
  ])("refuses %j with a clear message", (query, message) => {
    const result = parse(query);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.message).toMatch(message);
  });
});

describe("the last complete quarter", () => {
  it("is the quarter before the one the agency's calendar is in", () => {
    expect(lastCompleteQuarter(new Date("2026-08-15T12:00:00Z"), "America/Chicago").toString()).toBe(
      "year=2026&quarter=2",
    );
  });

  it("reads the date in the agency's zone, so New Year's Eve evening in Chicago is still Q4", () => {
    // 2027-01-01 03:00 UTC is 2026-12-31 21:00 in Chicago (UTC−6): the last complete quarter is 2026 Q3.
    expect(lastCompleteQuarter(new Date("2027-01-01T03:00:00Z"), "America/Chicago").toString()).toBe(
      "year=2026&quarter=3",
    );
    expect(lastCompleteQuarter(new Date("2027-01-01T07:00:00Z"), "America/Chicago").toString()).toBe(
      "year=2026&quarter=4",
    );
  });
});
