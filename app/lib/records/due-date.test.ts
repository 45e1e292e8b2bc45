import Holidays from "date-holidays";
import { describe, expect, it } from "vitest";
import {
  addBusinessDays,
  businessDaysBetween,
  countStartDate,
  dueDate,
  federalDaysOff,
  isBusinessDay,
  parseClosureDays,
  RECORDS_DUE_RULES,
} from "./due-date";

describe("business days on the federal calendar", () => {
  // Hand-computed vectors, day of receipt excluded (shared/docs/reference-values.md, "Public records";
  // holidays per 5 U.S.C. 6103).
  it.each([
    ["2024-11-22", 5, "2024-12-02"], // Thanksgiving 2024-11-28
    ["2024-12-20", 20, "2025-01-22"], // Christmas, New Year, MLK Day 2025-01-20
    ["2021-12-23", 5, "2022-01-03"], // Christmas observed Fri 12-24, New Year 2022 observed Fri 2021-12-31
    ["2023-11-06", 10, "2023-11-21"], // Veterans Day (Sat 11-11) observed Fri 11-10
    ["2026-06-30", 3, "2026-07-06"], // Independence Day (Sat) observed Fri 07-03
    ["2027-12-17", 10, "2028-01-04"], // Christmas (Sat) observed 12-24, New Year 2028 (Sat) observed 2027-12-31
  ])("%s + %i business days is %s", (from, days, expected) => {
    expect(addBusinessDays(from, days)).toBe(expected);
  });

  it("has the 11 holidays of 5 U.S.C. 6103(a) each year, Juneteenth included since 2021", () => {
    // date-holidays marks the legal holidays as type "public"; the Saturday and Sunday dates
    // themselves are listed too, beside the weekday they are observed on.
    const weekdays = (year: number) => [...federalDaysOff(year)].filter((day) => isBusinessDay(day) === false);
    for (const year of [2021, 2024, 2026, 2027]) {
      const onWeekdays = [...federalDaysOff(year)].filter((day) => {
        const weekday = new Date(`${day}T00:00:00Z`).getUTCDay();
        return weekday !== 0 && weekday !== 6;
      });
      // 2021 and 2027 carry the next year's New Year observed on Dec 31 as a twelfth weekday.
      expect(onWeekdays.length, String(year)).toBe(year === 2021 || year === 2027 ? 12 : 11);
      expect(weekdays(year).length).toBeGreaterThanOrEqual(11);
    }
    expect(federalDaysOff(2026).has("2026-06-19")).toBe(true); // Juneteenth, Friday
    expect(federalDaysOff(2027).has("2027-06-18")).toBe(true); // Juneteenth (Sat) observed Friday
    expect(federalDaysOff(2028).has("2028-07-04")).toBe(true);
  });

  it("agrees with date-holidays itself on every weekday of two years", () => {
    const calendar = new Holidays("US");
    for (const year of [2025, 2026]) {
      for (
        let day = new Date(Date.UTC(year, 0, 1));
        day.getUTCFullYear() === year;
        day.setUTCDate(day.getUTCDate() + 1)
      ) {
        const iso = day.toISOString().slice(0, 10);
        const weekday = day.getUTCDay();
        const holiday = (calendar.isHoliday(new Date(`${iso}T12:00:00`)) || []).some(
          (entry) => entry.type === "public",
        );
        expect(isBusinessDay(iso), iso).toBe(weekday !== 0 && weekday !== 6 && !holiday);
      }
    }
  });

  it("skips the agency's own closure days", () => {
    // 2026-11-27, the day after Thanksgiving, is no federal holiday; an agency may close on it.
    expect(addBusinessDays("2026-11-24", 3)).toBe("2026-11-30");
    expect(addBusinessDays("2026-11-24", 3, { closureDays: ["2026-11-27"] })).toBe("2026-12-01");
  });

  it("counts days left both ways", () => {
    expect(businessDaysBetween("2026-12-02", "2026-12-02")).toBe(0);
    expect(businessDaysBetween("2026-12-02", "2026-12-04")).toBe(2);
    expect(businessDaysBetween("2026-12-04", "2026-12-07")).toBe(1); // over a weekend
    expect(businessDaysBetween("2026-12-09", "2026-12-07")).toBe(-2);
    expect(businessDaysBetween("2026-12-23", "2026-12-28")).toBe(2); // Christmas Friday 12-25
  });
});

describe("day 0 of the count", () => {
  it("is the day of receipt within office hours, else the next business day", () => {
    expect(countStartDate("2026-12-02", "16:59", "17:00")).toBe("2026-12-02");
    expect(countStartDate("2026-12-02", "17:00", "17:00")).toBe("2026-12-03");
    expect(countStartDate("2026-12-04", "18:30", "17:00")).toBe("2026-12-07"); // Friday evening → Monday
    expect(countStartDate("2026-12-05", "09:00", "17:00")).toBe("2026-12-07"); // Saturday → Monday
    expect(countStartDate("2026-12-24", "18:00", "17:00")).toBe("2026-12-28"); // Christmas Friday 12-25
  });
});

describe("the rules", () => {
  it("gives federal, state and calendar-day due dates", () => {
    // 5 U.S.C. 552(a)(6)(A): 20 working days.
    expect(dueDate("2024-12-20", RECORDS_DUE_RULES.federal)).toBe("2025-01-22");
    // 5 ILCS 140/3: 5 business days, and 5 more on extension.
    expect(dueDate("2024-11-22", RECORDS_DUE_RULES.illinois)).toBe("2024-12-02");
    expect(dueDate("2024-11-22", RECORDS_DUE_RULES.illinois, {}, 5)).toBe("2024-12-09");
    // Cal. Gov. Code §7922.535: 10 calendar days.
    expect(dueDate("2026-12-24", RECORDS_DUE_RULES.california)).toBe("2027-01-03");
    // C.R.S. 24-72-203: 3 working days.
    expect(dueDate("2026-06-30", RECORDS_DUE_RULES.colorado)).toBe("2026-07-06");
  });

  it("reads closure days from the setting's text", () => {
    expect(parseClosureDays("2026-11-27, 2026-12-24\n2026-12-31; nonsense")).toEqual([
      "2026-11-27",
      "2026-12-24",
      "2026-12-31",
    ]);
  });
});
