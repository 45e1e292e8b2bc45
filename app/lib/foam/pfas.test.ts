import { describe, expect, it } from "vitest";
import { pfasGrams, pfasGramsPerLitre, rollingWindowTotals } from "./pfas";
import { GRAMS_PER_POUND } from "./units";

describe("PFAS mass estimates", () => {
  it("turns a g/L content into grams for a volume of concentrate", () => {
    // 10 g/L: the middle of the legacy PFOS AFFF range 5–15 g/L (an old product safety sheet;
    // academic measurements from memory). 90 US gal × 3.785411784 L/gal (NIST Handbook 44) = 340.68706056 L.
    expect(pfasGrams(90, 10, "g_per_l")).toBeCloseTo(3406.8706056, 6);
    // 1 lb = 453.59237 g (NIST Handbook 44): about 7.51 lb, well over the 1 lb CERCLA RQ (40 CFR 302.4).
    expect(pfasGrams(90, 10, "g_per_l") / GRAMS_PER_POUND).toBeCloseTo(7.510864, 5);
  });

  it("reads mg/L and % w/w (at 1 kg/L) the same way", () => {
    expect(pfasGramsPerLitre(10_000, "mg_per_l")).toBe(10);
    // 1 % w/w of a concentrate weighing 1 kg/L is 10 g/L — the "0.5–1.5 % w/w ≈ 5–15 g/L" pairing above.
    expect(pfasGramsPerLitre(1, "percent_w_w")).toBe(10);
  });

  it("finds the heaviest 24-hour period, excluding a release exactly 24 h later", () => {
    const at = (hours: number) => new Date(Date.UTC(2026, 6, 1) + hours * 3_600_000);
    const totals = rollingWindowTotals([
      { at: at(30), pounds: 0.4 },
      { at: at(0), pounds: 0.5 },
      { at: at(23.5), pounds: 0.3 },
      { at: at(47.5), pounds: 0.2 },
    ]);
    expect(totals[1]).toBeCloseTo(0.8, 12); // 0 h and 23.5 h
    expect(totals[2]).toBeCloseTo(0.7, 12); // 23.5 h and 30 h; 47.5 h is exactly 24 h later, outside
    expect(totals[0]).toBeCloseTo(0.6, 12); // 30 h and 47.5 h
    expect(totals[3]).toBeCloseTo(0.2, 12);
  });
});
