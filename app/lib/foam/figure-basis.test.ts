import { describe, expect, it } from "vitest";
import { figureBasis } from "./figure-basis";
import { FIGURE_BASIS_LABELS } from "./vocabulary";

// Issue 10 §4: the workbook speaks to a regulator, so it gives a short "Basis" instead of raw
// notes such as "from memory".
describe("figureBasis", () => {
  it("calls a recalled or estimated figure an estimate, whatever else the note names", () => {
    const seedNote =
      "Estimate from the legacy AFFF range of about 5–15 g/L reported on an old product safety sheet (from memory); not measured for this stock.";
    expect(figureBasis(seedNote)).toBe("estimate");
    expect(figureBasis("value from memory")).toBe("estimate");
    expect(FIGURE_BASIS_LABELS[figureBasis(seedNote)]).not.toMatch(/memory/i);
  });

  it("names laboratory results, safety sheets, common practice and other sources", () => {
    expect(figureBasis("Laboratory result, EPA Method 1633, lot 7")).toBe("measured");
    expect(figureBasis("Manufacturer's SDS, section 3")).toBe("safety_sheet");
    expect(figureBasis("Common practice, no source")).toBe("practice");
    expect(figureBasis("Maker's technical bulletin TB-12")).toBe("published");
  });

  it("says when nothing was recorded", () => {
    expect(figureBasis(null)).toBe("not_recorded");
    expect(figureBasis("   ")).toBe("not_recorded");
  });
});
