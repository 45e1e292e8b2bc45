import { describe, expect, it } from "vitest";
import { addDays, addMonths, daysBetween, reminderStage, systemSchedule } from "./system-schedule";

const intervals = { accuracyTestIntervalMonths: 12, flushIntervalDays: 90 };

describe("due dates of a foam system", () => {
  it("adds months across a year end, keeping the day or the month's last day", () => {
    expect(addMonths("2025-12-15", 12)).toBe("2026-12-15");
    expect(addMonths("2026-11-30", 3)).toBe("2027-02-28");
    expect(addMonths("2027-12-31", 2)).toBe("2028-02-29"); // 2028 is a leap year
    expect(addMonths("2024-02-29", 12)).toBe("2025-02-28");
  });

  it("adds days across a year end", () => {
    expect(addDays("2026-12-15", 30)).toBe("2027-01-14");
    expect(addDays("2026-11-01", 90)).toBe("2027-01-30");
    expect(daysBetween("2026-12-31", "2027-01-01")).toBe(1);
  });

  it("owes a test at once for a system never tested, and a year after the last passing one", () => {
    const base = { enteredOn: "2026-01-10", lastFlushOn: "2026-11-20", status: "in_service" as const };
    expect(systemSchedule({ ...base, lastPassingTestOn: null }, intervals, "2026-12-02")).toMatchObject({
      nextTestDue: "2026-01-10",
      status: "overdue",
    });
    expect(systemSchedule({ ...base, lastPassingTestOn: "2025-12-20" }, intervals, "2026-12-02")).toMatchObject({
      nextTestDue: "2026-12-20",
      nextFlushDue: "2027-02-18",
      status: "due_soon",
    });
    expect(systemSchedule({ ...base, lastPassingTestOn: "2026-06-01" }, intervals, "2026-12-02")).toMatchObject({
      nextTestDue: "2027-06-01",
      status: "current",
    });
  });

  it("puts out of tolerance before any due date", () => {
    expect(
      systemSchedule(
        {
          enteredOn: "2026-01-01",
          lastPassingTestOn: "2026-06-01",
          lastFlushOn: "2026-11-30",
          status: "out_of_tolerance",
        },
        intervals,
        "2026-12-02",
      ).status,
    ).toBe("out_of_tolerance");
  });

  it("reminds 30 days ahead and again when overdue", () => {
    expect(reminderStage("2027-01-01", "2026-12-02")).toBe("due_soon");
    expect(reminderStage("2027-01-02", "2026-12-02")).toBeNull();
    expect(reminderStage("2026-12-01", "2026-12-02")).toBe("overdue");
    expect(reminderStage("2026-12-02", "2026-12-02")).toBe("due_soon");
  });
});
