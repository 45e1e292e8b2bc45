import { describe, expect, it } from "vitest";
import { wallClockToInstant } from "../time-zone";
import { lineMinutes, minutesBetween } from "./report-schema";
import { computeDischarge, DURATION_TOLERANCE_MINUTES } from "./totals";

// Issue 10 §4: durations across daylight-saving changes are computed from instants. On 8 March 2026
// clocks in America/Chicago went from 02:00 CST to 03:00 CDT (IANA time-zone database; the second
// Sunday of March, 15 U.S.C. 260a), so 01:30 → 03:10 is 40 minutes, not 100.
const ZONE = "America/Chicago";

describe("durations across a daylight-saving change", () => {
  it("counts 01:30 → 03:10 on 8 March 2026 in Chicago as 40 minutes", () => {
    expect(minutesBetween("2026-03-08T01:30", "2026-03-08T03:10", ZONE)).toBe(40);
    expect(lineMinutes({ startedAt: "2026-03-08T01:30", endedAt: "2026-03-08T03:10" }, ZONE)).toBe(40);
  });

  it("counts the hour repeated when clocks fell back on 1 November 2026", () => {
    // 00:30 → 03:00 on 1 November 2026: 01:00–02:00 happened twice, so 2 h 30 min of wall clock is 3 h 30 min.
    expect(minutesBetween("2026-11-01T00:30", "2026-11-01T03:00", ZONE)).toBe(210);
  });

  it("keeps typed minutes and ordinary spans as they are", () => {
    expect(lineMinutes({ minutes: 25, startedAt: "2026-03-08T01:30", endedAt: "2026-03-08T03:10" }, ZONE)).toBe(25);
    expect(minutesBetween("2026-06-01T10:00", "2026-06-01T10:45", ZONE)).toBe(45);
  });
});

describe("typed minutes that disagree with the start and end times", () => {
  const startedAt = wallClockToInstant("2026-03-08T01:30", ZONE);
  const endedAt = wallClockToInstant("2026-03-08T03:10", ZONE);
  const line = { flow: 100, flowUnit: "gpm" as const, basis: "water" as const, percent: 0.5, startedAt, endedAt };
  const codes = (minutes: number) => computeDischarge({ ...line, minutes }).warnings.map((warning) => warning.code);

  it("warn when they differ by more than a minute (100 typed against the 40 that passed)", () => {
    expect(codes(100)).toContain("duration_mismatch");
    expect(
      computeDischarge({ ...line, minutes: 100 }).warnings.find((w) => w.code === "duration_mismatch"),
    ).toMatchObject({ field: "minutes", message: expect.stringContaining("40 min") });
  });

  it("do not warn within a minute", () => {
    expect(codes(40)).not.toContain("duration_mismatch");
    expect(codes(40 + DURATION_TOLERANCE_MINUTES)).not.toContain("duration_mismatch");
    expect(computeDischarge({ ...line, minutes: 100, startedAt: null }).warnings).toEqual([]);
  });
});
