import { describe, expect, it } from "vitest";
import {
  endOfLocalDay,
  formatInstantInZone,
  instantToWallClock,
  isCalendarDay,
  isWallClock,
  keptZoneOffsetMinutes,
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

  it("refuses days the calendar does not have and years no record falls in, never rolling them over", () => {
    for (const wallClock of ["2026-02-30T10:00", "2026-04-31T08:00", "2026-13-01T00:00", "2026-06-01T24:00"]) {
      expect(isWallClock(wallClock), wallClock).toBe(false);
      expect(wallClockToInstant(wallClock, zone), wallClock).toBeNull();
    }
    // 9999-12-31 23:59 in Chicago is past the end of a DATETIME column once in UTC; year 0099 would be read as 1999.
    for (const wallClock of ["9999-12-31T23:59", "0099-01-01T00:00", "1899-12-31T23:59", "2200-01-01T00:00"]) {
      expect(wallClockToInstant(wallClock, zone), wallClock).toBeNull();
    }
    expect(isWallClock("2028-02-29T23:59:59")).toBe(true);
    expect(isWallClock("2026-02-28T23:59")).toBe(true);
    expect(isCalendarDay("2028-02-29")).toBe(true);
    for (const day of ["2027-02-29", "2026-02-30", "2026-00-10", "0999-12-31", "9999-12-31", "2026-2-3"]) {
      expect(isCalendarDay(day), day).toBe(false);
    }
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

  it("keeps the offset per hour yet agrees with Intl minute by minute across daylight-saving changes", () => {
    // America/St_Johns (UTC−3:30, daylight UTC−2:30) changes at 02:00 local, i.e. at :30 past a UTC
    // hour, so that hour must not be kept whole; 2026 dates from the tz data, checked by Intl itself.
    for (const [timeZone, from] of [
      ["America/St_Johns", "2026-03-08T04:00:00Z"],
      ["America/St_Johns", "2026-11-01T03:00:00Z"],
      [zone, "2026-11-01T05:00:00Z"],
      // Lord Howe Island moves its clocks by half an hour.
      ["Australia/Lord_Howe", "2026-04-04T14:00:00Z"],
    ] as const) {
      const toWall = wallClockIn(timeZone);
      const start = new Date(from).getTime();
      const mismatches: string[] = [];
      for (let minute = 0; minute < 180; minute += 1) {
        const instant = new Date(start + minute * 60_000 + 7_000);
        const expected = new Date(instant.getTime() + zoneOffsetMinutes(instant, timeZone) * 60_000);
        if (toWall(instant)?.getTime() !== expected.getTime()) mismatches.push(instant.toISOString());
        if (keptZoneOffsetMinutes(instant, timeZone) !== zoneOffsetMinutes(instant, timeZone)) {
          mismatches.push(`offset ${instant.toISOString()}`);
        }
        if (instantToWallClock(instant, timeZone) !== expected.toISOString().slice(0, 16)) {
          mismatches.push(`wall clock ${instant.toISOString()}`);
        }
      }
      expect(mismatches, timeZone).toEqual([]);
      // The change really is in the range: the first and last minute have different offsets.
      expect(zoneOffsetMinutes(new Date(start), timeZone)).not.toBe(
        zoneOffsetMinutes(new Date(start + 179 * 60_000), timeZone),
      );
    }
  });
});

describe("an instant as the agency reads it", () => {
  // Clocks in America/Chicago went from 02:00 CST to 03:00 CDT on 8 March 2026 (IANA tz database).
  it("gives the agency's date, clock and zone name, either side of a clock change", () => {
    const before = formatInstantInZone("2026-03-08T07:30:00Z", "America/Chicago");
    const after = formatInstantInZone(new Date("2026-03-08T08:10:00Z"), "America/Chicago");
    expect(before).toMatch(/^Mar 8, 2026, 1:30\sAM CST$/);
    expect(after).toMatch(/^Mar 8, 2026, 3:10\sAM CDT$/);
  });
});
