import { describe, expect, it } from "vitest";
import { pastShelfLife, shelfLifeEnds } from "./shelf-life";

describe("a lot's shelf life", () => {
  it("ends its shelf-life months after it was made, on the last day of a shorter month", () => {
    expect(shelfLifeEnds("2024-03-15", 24)).toBe("2026-03-15");
    expect(shelfLifeEnds("2023-08-31", 6)).toBe("2024-02-29");
    expect(shelfLifeEnds(null, 24)).toBeNull();
    expect(shelfLifeEnds("2024-03-15", null)).toBeNull();
  });

  it("is past after its last day, and never when its end is not known", () => {
    expect(pastShelfLife("2024-03-15", 24, "2026-03-15")).toBe(false);
    expect(pastShelfLife("2024-03-15", 24, "2026-03-16")).toBe(true);
    expect(pastShelfLife(null, 24, "2099-01-01")).toBe(false);
    expect(pastShelfLife("2000-01-01", null, "2099-01-01")).toBe(false);
  });
});
