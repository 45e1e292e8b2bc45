import { describe, expect, it } from "vitest";
import {
  endOfLocalDay,
  instantToWallClock,
  localDateTime,
  startOfLocalDay,
  wallClockIn,
  wallClockToInstant,
  zoneOffsetMinutes,
} from "./time-zone";

// Offsets of America/Chicago: CST is UTC−6, CDT UTC−5; in 2026 daylight time runs from 8 March
// 02:00 to 1 November 02:00 local (US rule, 15 U.S.C. 260a; dates from memory, checked by the tz data).
const zone = "America/Chicago";

describe("time zones", () => {
  it("knows the winter and summer offsets", () => {
    expect(zoneOffsetMinutes(new Date("2026-01-15T12:00:00Z"), zone)).toBe(-360);
    expect(zoneOffsetMinutes(new Date("2026-07-15T12:00:00Z"), zone)).toBe(-300);
  });

  it("turns a typed local time into the instant, and back", () => {
    expect(wallClockToInstant("2026-01-15T09:30", zone)?.toISOString()).toBe("2026-01-15T15:30:00.000Z");
    expect(wallClockToInstant("2026-07-15T09:30", zone)?.toISOString()).toBe("2026-07-15T14:30:00.000Z");
    expect(instantToWallClock(new Date("2026-07-15T14:30:00Z"), zone)).toBe("2026-07-15T09:30");
  });

  it("handles the days the clocks change", () => {
    expect(wallClockToInstant("2026-03-08T03:30", zone)?.toISOString()).toBe("2026-03-08T08:30:00.000Z");
    expect(wallClockToInstant("2026-11-01T00:30", zone)?.toISOString()).toBe("2026-11-01T05:30:00.000Z");
    expect(instantToWallClock(new Date("2026-11-01T08:30:00Z"), zone)).toBe("2026-11-01T02:30");
  });

  it("refuses text that is not a time", () => {
    expect(wallClockToInstant("yesterday", zone)).toBeNull();
    expect(wallClockToInstant("", zone)).toBeNull();
    expect(instantToWallClock(null, zone)).toBe("");
  });

  it("gives a day's first instant and the first instant after it, across a clock change", () => {
    // 8 March 2026 starts in standard time (UTC−6) and ends in daylight time (UTC−5): 23 hours long.
    expect(startOfLocalDay("2026-03-08", zone).toISOString()).toBe("2026-03-08T06:00:00.000Z");
    expect(endOfLocalDay("2026-03-08", zone).toISOString()).toBe("2026-03-09T05:00:00.000Z");
    expect(endOfLocalDay("2026-12-31", zone).toISOString()).toBe("2027-01-01T06:00:00.000Z");
    expect(() => startOfLocalDay("31/12/2026", zone)).toThrow(RangeError);
  });

  it("shows an instant as the agency's clocks did, for pages and for spreadsheet cells", () => {
    expect(localDateTime(new Date("2026-11-01T08:30:00Z"), zone)).toBe("2026-11-01 02:30");
    const toWall = wallClockIn(zone);
    expect(toWall(new Date("2026-07-15T14:30:15.750Z"))?.toISOString()).toBe("2026-07-15T09:30:15.000Z");
    expect(toWall(null)).toBeNull();
  });
});
