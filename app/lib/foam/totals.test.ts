import convert from "convert-units";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { computeDischarge, computeUsage, usualPercentRange, type ApparatusFacts, type ProductFacts } from "./totals";
import { flowInGpm, gallonsToLitres, LITRES_PER_US_GALLON, litresToGallons, roundForDisplay } from "./units";

const classA: ProductFacts = {
  id: 1,
  name: "Demo Class A",
  foamClass: "A",
  nominalPercents: [0.3],
  pfasContaining: false,
};
const arAfff: ProductFacts = {
  id: 2,
  name: "Demo AR-AFFF",
  foamClass: "B",
  nominalPercents: [3, 6],
  pfasContaining: true,
};
const engine: ApparatusFacts = {
  id: 7,
  unitId: "E1",
  proportionerMaxConcentrateGpm: 20,
  waterFlowMinGpm: 10,
  waterFlowMaxGpm: 1500,
};
const products = new Map([classA, arAfff].map((product) => [product.id, product]));
const apparatus = new Map([[engine.id, engine]]);

describe("units", () => {
  it("uses the exact US gallon: 231 in³ = 3.785411784 L (NIST Handbook 44, Appendix C)", () => {
    expect(LITRES_PER_US_GALLON).toBe(3.785411784);
    expect(231 * 2.54 ** 3).toBeCloseTo(3785.411784, 9); // 1 in = 2.54 cm exactly
  });

  it("agrees with the convert-units package, whose gallon is rounded (within 1.2e-8 L, about 3e-9 relative)", () => {
    const reference = convert(1).from("gal").to("l");
    expect(Math.abs(reference - LITRES_PER_US_GALLON)).toBeLessThan(1.2e-8);
  });

  it("round-trips gallons and litres, and L/min to gpm (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e7, noNaN: true }), (gallons) => {
        expect(litresToGallons(gallonsToLitres(gallons))).toBeCloseTo(gallons, 6);
        expect(flowInGpm(gallonsToLitres(gallons), "lpm")).toBeCloseTo(gallons, 6);
      }),
    );
  });

  it("rounds only for display", () => {
    expect(roundForDisplay(7570.823568)).toBe(7570.82);
    expect(roundForDisplay(22.712470704)).toBe(22.71);
  });
});

describe("computeDischarge", () => {
  it("solution basis: the NFPA 11 spill worked example (3,000 ft² × 0.20 gpm/ft² × 3 % × 15 min)", () => {
    // Fire-service training example of the NFPA 11 method: 600 gpm solution, 18 gpm concentrate,
    // 270 gal concentrate, 9,000 gal solution, 8,730 gal water.
    const result = computeDischarge({ flow: 3000 * 0.2, flowUnit: "gpm", basis: "solution", percent: 3, minutes: 15 });
    expect(result.concentrateGpm).toBeCloseTo(18, 10);
    expect(result.concentrate.gal).toBeCloseTo(270, 10);
    expect(result.solution.gal).toBeCloseTo(9000, 10);
    expect(result.water.gal).toBeCloseTo(8730, 10);
  });

  it("solution basis: 150 gpm × 0.5 % × 20 min = 15 gal concentrate and 2,985 gal water (computed by hand)", () => {
    const result = computeDischarge({ flow: 150, flowUnit: "gpm", basis: "solution", percent: 0.5, minutes: 20 });
    expect(result.concentrate.gal).toBeCloseTo(15, 10);
    expect(result.water.gal).toBeCloseTo(2985, 10);
    expect(result.solution.gal).toBeCloseTo(3000, 10);
  });

  it("water basis (direct injection): 200 gpm at 0.3 % → 0.6 gpm; 295 gpm at 1 % → 2.95 gpm (common practice, no source)", () => {
    expect(
      computeDischarge({ flow: 200, flowUnit: "gpm", basis: "water", percent: 0.3, minutes: 1 }).concentrateGpm,
    ).toBeCloseTo(0.6, 12);
    expect(
      computeDischarge({ flow: 295, flowUnit: "gpm", basis: "water", percent: 1, minutes: 1 }).concentrateGpm,
    ).toBeCloseTo(2.95, 12);
  });

  it("water basis: 200 gpm water at 0.3 % for 10 min is 2,000 gal water, 6 gal concentrate, 2,006 gal solution", () => {
    const result = computeDischarge({ flow: 200, flowUnit: "gpm", basis: "water", percent: 0.3, minutes: 10 });
    expect(result.water.gal).toBeCloseTo(2000, 10);
    expect(result.concentrate.gal).toBeCloseTo(6, 10);
    expect(result.solution.gal).toBeCloseTo(2006, 10);
    expect(roundForDisplay(result.water.L)).toBe(7570.82);
    expect(roundForDisplay(result.concentrate.L)).toBe(22.71);
    expect(roundForDisplay(result.solution.L)).toBe(7593.54);
  });

  it("takes L/min through the exact gallon", () => {
    const result = computeDischarge({ flow: 757.0823568, flowUnit: "lpm", basis: "water", percent: 1, minutes: 10 });
    expect(result.water.gal).toBeCloseTo(2000, 9);
    expect(result.concentrate.gal).toBeCloseTo(20, 9);
  });

  it("a water-only line has no concentrate", () => {
    const result = computeDischarge({ flow: 150, flowUnit: "gpm", basis: "water", percent: null, minutes: 4 });
    expect(result.concentrate.gal).toBe(0);
    expect(result.solution.gal).toBe(600);
    expect(result.effectivePercent).toBeNull();
  });

  it("caps concentrate at the proportioner maximum and reports the effective percentage = maximum ÷ flow", () => {
    const result = computeDischarge(
      { flow: 1000, flowUnit: "gpm", basis: "water", percent: 3, minutes: 10, apparatusId: 7 },
      { apparatus },
    );
    expect(result.concentrateGpm).toBe(20);
    expect(result.effectivePercent).toBeCloseTo(2, 12);
    expect(result.concentrate.gal).toBeCloseTo(200, 10);
    expect(result.warnings.map((warning) => warning.code)).toEqual(["proportioner_limit"]);
    expect(result.warnings[0].message).toMatch(/effective percentage was about 2 %/);
  });

  it("warns, never refuses, for a percent outside the usual range of the foam class", () => {
    const wetting = computeDischarge(
      { flow: 100, flowUnit: "gpm", basis: "water", percent: 2, minutes: 1, productId: 1 },
      { products },
    );
    expect(wetting.warnings.map((warning) => warning.code)).toEqual(["percent_unusual_for_class"]);
    const ok = computeDischarge(
      { flow: 100, flowUnit: "gpm", basis: "water", percent: 0.5, minutes: 1, productId: 1 },
      { products },
    );
    expect(ok.warnings).toEqual([]);
    expect(ok.foamClass).toBe("A");
  });

  it("accepts Class B from the rated percent to the lesser of +30 % and +1 point (NFPA 11 / UL 162)", () => {
    const [[low3, high3]] = usualPercentRange("B", [3]);
    const [[low6, high6]] = usualPercentRange("B", [6]);
    expect([low3, low6]).toEqual([3, 6]);
    expect(high3).toBeCloseTo(3.9, 12);
    expect(high6).toBe(7);
    const at = (percent: number) =>
      computeDischarge(
        { flow: 100, flowUnit: "gpm", basis: "solution", percent, minutes: 1, productId: 2 },
        { products },
      ).warnings.length;
    expect(at(3)).toBe(0);
    expect(at(3.9)).toBe(0);
    expect(at(4.5)).toBe(1);
    expect(at(6.5)).toBe(0);
    expect(at(2.5)).toBe(1);
  });

  it("warns for a water flow outside the apparatus's range and for times outside the event", () => {
    const result = computeDischarge(
      {
        flow: 2000,
        flowUnit: "gpm",
        basis: "water",
        percent: null,
        minutes: 5,
        apparatusId: 7,
        startedAt: new Date("2026-03-01T09:00:00Z"),
        endedAt: new Date("2026-03-01T09:05:00Z"),
      },
      { apparatus, eventWindow: { start: new Date("2026-03-01T09:10:00Z"), end: new Date("2026-03-01T10:00:00Z") } },
    );
    expect(result.warnings.map((warning) => warning.code).sort()).toEqual([
      "flow_out_of_range",
      "outside_event_window",
    ]);
  });

  it("keeps water + concentrate = solution on either basis (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.1, max: 5000, noNaN: true }),
        fc.double({ min: 0.01, max: 99, noNaN: true }),
        fc.double({ min: 0.1, max: 1440, noNaN: true }),
        fc.constantFrom("water" as const, "solution" as const),
        fc.constantFrom("gpm" as const, "lpm" as const),
        (flow, percent, minutes, basis, flowUnit) => {
          const result = computeDischarge({ flow, flowUnit, basis, percent, minutes });
          expect(result.water.gal + result.concentrate.gal).toBeCloseTo(result.solution.gal, 6);
          expect(result.concentrate.gal).toBeGreaterThanOrEqual(0);
          expect(result.water.gal).toBeGreaterThan(0);
        },
      ),
    );
  });
});

describe("computeUsage", () => {
  const lines = [
    {
      flow: 200,
      flowUnit: "gpm" as const,
      basis: "water" as const,
      percent: 0.3,
      minutes: 10,
      productId: 1,
      apparatusId: 7,
    },
    {
      flow: 600,
      flowUnit: "gpm" as const,
      basis: "solution" as const,
      percent: 3,
      minutes: 15,
      productId: 2,
      apparatusId: 7,
    },
    { flow: 150, flowUnit: "gpm" as const, basis: "water" as const, percent: null, minutes: 4 },
  ];

  it("totals the event and groups by apparatus, product and foam class", () => {
    const usage = computeUsage(lines, { products, apparatus });
    expect(usage.totals.water.gal).toBeCloseTo(2000 + 8730 + 600, 9);
    expect(usage.totals.concentrate.gal).toBeCloseTo(6 + 270, 9);
    expect(usage.totals.solution.gal).toBeCloseTo(2006 + 9000 + 600, 9);
    expect(usage.byClass.find((group) => group.foamClass === "B")?.totals.concentrate.gal).toBeCloseTo(270, 9);
    expect(usage.byProduct.find((group) => group.productId === null)?.totals.water.gal).toBe(600);
    expect(usage.byApparatus.find((group) => group.apparatusId === 7)?.totals.concentrate.gal).toBeCloseTo(276, 9);
    expect(usage.pfasContaining).toBe(true);
  });

  it("flags a tank drawdown that differs from the computed concentrate by more than the tolerance", () => {
    const reading = (refillGal: number) => ({
      apparatusId: 7,
      productId: 2,
      refillGal,
      levelBeforeGal: null,
      levelAfterGal: null,
    });
    const close = computeUsage(lines, { products, apparatus, tankReadings: [reading(280)], drawdownTolerance: 0.15 });
    expect(close.eventWarnings).toEqual([]);
    const far = computeUsage(lines, { products, apparatus, tankReadings: [reading(200)], drawdownTolerance: 0.15 });
    expect(far.eventWarnings.map((warning) => warning.code)).toEqual(["drawdown_mismatch"]);
    expect(far.eventWarnings[0].message).toMatch(/270 gal differs from the tank drawdown of 200 gal on E1 by 26 %/);
    const levels = computeUsage(lines, {
      products,
      apparatus,
      tankReadings: [{ apparatusId: 7, productId: 2, refillGal: null, levelBeforeGal: 400, levelAfterGal: 130 }],
    });
    expect(levels.eventWarnings).toEqual([]);
  });
});

describe("the percentage convention: of foam solution or of water", () => {
  const at = (input: Partial<Parameters<typeof computeDischarge>[0]>) =>
    computeDischarge({ flow: 100, flowUnit: "gpm", basis: "water", percent: 3, minutes: 10, ...input });

  it("water basis, % of solution: 97 gpm water × 10 min at 3 % → 30 gal concentrate, 1,000 gal solution (W ÷ (1 − p); reference check value computed from the definition)", () => {
    const result = at({ flow: 97, percentOf: "solution" });
    expect(result.concentrateGpm).toBeCloseTo(3, 12);
    expect(result.concentrate.gal).toBeCloseTo(30, 10);
    expect(result.solution.gal).toBeCloseTo(1000, 10);
    expect(result.water.gal).toBeCloseTo(970, 10);
    expect(result.effectivePercentOfSolution).toBeCloseTo(3, 12);
  });

  it("water basis, % of water: 200 gpm at 0.3 % → 0.6 gpm (direct injection; common practice, no source)", () => {
    const result = at({ flow: 200, percent: 0.3, percentOf: "water" });
    expect(result.concentrateGpm).toBeCloseTo(0.6, 12);
    expect(result.effectivePercentOfSolution).toBeCloseTo((0.6 / 200.6) * 100, 12);
  });

  it("solution basis, % of solution: 600 gpm × 3 % × 15 min → 270 gal concentrate, 8,730 gal water (NFPA 11 method training example)", () => {
    const result = at({ flow: 600, basis: "solution", percentOf: "solution", minutes: 15 });
    expect(result.concentrate.gal).toBeCloseTo(270, 10);
    expect(result.water.gal).toBeCloseTo(8730, 10);
    expect(result.effectivePercentOfSolution).toBeCloseTo(3, 12);
  });

  it("solution basis, % of water: concentrate = S·p ÷ (1 + p) (issue arithmetic; 103 gpm solution at 3 % of water → 3 gpm)", () => {
    const result = at({ flow: 103, basis: "solution", percentOf: "water" });
    expect(result.concentrateGpm).toBeCloseTo(3, 12);
    expect(result.water.gal).toBeCloseTo(1000, 10);
  });

  it("defaults keep today's meaning: water basis → % of water, solution basis → % of solution", () => {
    expect(at({}).percentOf).toBe("water");
    expect(at({ basis: "solution" }).percentOf).toBe("solution");
  });

  it("the apparatus's proportioner gives the default: direct injection → water, eductor → solution", () => {
    const unit = (proportionerType: ApparatusFacts["proportionerType"]) =>
      new Map([[9, { ...engine, id: 9, proportionerMaxConcentrateGpm: null, proportionerType }]]);
    expect(at({ apparatusId: 9 }).percentOf).toBe("water");
    expect(computeDischarge({ ...baseLine, apparatusId: 9 }, { apparatus: unit("eductor") }).percentOf).toBe(
      "solution",
    );
    expect(computeDischarge({ ...baseLine, apparatusId: 9 }, { apparatus: unit("direct_injection") }).percentOf).toBe(
      "water",
    );
    // A choice on the line wins over the apparatus.
    expect(
      computeDischarge({ ...baseLine, apparatusId: 9, percentOf: "water" }, { apparatus: unit("premix") }).percentOf,
    ).toBe("water");
  });

  it("the two conventions differ by 3.1 % of concentrate at 3 % and 6.4 % at 6 % (reference values: NFPA 11 §12.6.5 vs. common practice)", () => {
    for (const [percent, expected] of [
      [3, 3.1],
      [6, 6.4],
    ]) {
      const ofWater = at({ percent, percentOf: "water" }).concentrate.gal;
      const ofSolution = at({ percent, percentOf: "solution" }).concentrate.gal;
      expect((ofSolution / ofWater - 1) * 100).toBeCloseTo(expected, 1);
    }
  });

  it("a capped line: the effective percentage of solution follows from the capped rate over the solution", () => {
    const result = computeDischarge(
      { flow: 1000, flowUnit: "gpm", basis: "water", percent: 3, percentOf: "solution", minutes: 10, apparatusId: 7 },
      { apparatus },
    );
    expect(result.concentrateGpm).toBe(20);
    expect(result.effectivePercentOfSolution).toBeCloseTo((20 / 1020) * 100, 12);
    expect(result.warnings[0].message).toMatch(/about 1.961 % of the foam solution/);
  });

  it("Class B: 3 % of the water flow gives 2.913 % of solution, below the rated 3 % — its own warning (NFPA 11 §12.6.5 band on the achieved share)", () => {
    const result = computeDischarge(
      { flow: 100, flowUnit: "gpm", basis: "water", percent: 3, percentOf: "water", minutes: 1, productId: 2 },
      { products },
    );
    expect(result.effectivePercentOfSolution).toBeCloseTo(2.9126, 3);
    expect(result.warnings.map((warning) => warning.code)).toEqual(["below_rated"]);
    expect(result.warnings[0].message).toMatch(/below the rated 3 % .*foam may not perform/);
    const ofSolution = computeDischarge(
      { flow: 100, flowUnit: "gpm", basis: "water", percent: 3, percentOf: "solution", minutes: 1, productId: 2 },
      { products },
    );
    expect(ofSolution.warnings).toEqual([]);
  });

  it("Class B above the band names the band and the percentage of solution it was checked on", () => {
    const result = computeDischarge(
      { flow: 100, flowUnit: "gpm", basis: "solution", percent: 4.5, minutes: 1, productId: 2 },
      { products },
    );
    expect(result.warnings[0].code).toBe("percent_unusual_for_class");
    expect(result.warnings[0].message).toMatch(
      /3–3\.9 % band .*NFPA 11 §12\.6\.5, checked on the percentage of foam solution/,
    );
  });

  it("totals report the effective percentage of solution: concentrate ÷ solution × 100", () => {
    const usage = computeUsage([
      { ...baseLine, flow: 97, percentOf: "solution" },
      { ...baseLine, flow: 600, basis: "solution", percentOf: "solution" },
    ]);
    expect(usage.totals.effectivePercentOfSolution).toBeCloseTo(3, 10);
    expect(computeUsage([{ ...baseLine, percent: null }]).totals.effectivePercentOfSolution).toBeNull();
  });

  it("round trips (property): concentrate ÷ solution is p under % of solution and p ÷ (1 + p) under % of water, on either basis", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.1, max: 5000, noNaN: true }),
        fc.double({ min: 0.01, max: 50, noNaN: true }),
        fc.constantFrom("water" as const, "solution" as const),
        fc.constantFrom("water" as const, "solution" as const),
        (flow, percent, basis, percentOf) => {
          const result = computeDischarge({ flow, flowUnit: "gpm", basis, percent, percentOf, minutes: 1 });
          const share = percent / 100;
          expect(result.water.gal + result.concentrate.gal).toBeCloseTo(result.solution.gal, 6);
          const expected = percentOf === "solution" ? share : share / (1 + share);
          expect(result.effectivePercentOfSolution! / 100).toBeCloseTo(expected, 9);
          // Back to the setting: concentrate over its own denominator gives the set percentage.
          const denominator = percentOf === "water" ? result.water.gal : result.solution.gal;
          expect((result.concentrate.gal / denominator) * 100).toBeCloseTo(percent, 7);
          expect(result.effectivePercent).toBeCloseTo(percent, 9);
        },
      ),
    );
  });

  it("round trip (property): recomputing from the solution a water-basis line made gives back the same concentrate", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.1, max: 5000, noNaN: true }),
        fc.double({ min: 0.01, max: 50, noNaN: true }),
        fc.constantFrom("water" as const, "solution" as const),
        (water, percent, percentOf) => {
          const fromWater = computeDischarge({
            flow: water,
            flowUnit: "gpm",
            basis: "water",
            percent,
            percentOf,
            minutes: 1,
          });
          const fromSolution = computeDischarge({
            flow: fromWater.solution.gal,
            flowUnit: "gpm",
            basis: "solution",
            percent,
            percentOf,
            minutes: 1,
          });
          expect(fromSolution.concentrate.gal).toBeCloseTo(fromWater.concentrate.gal, 6);
          expect(fromSolution.water.gal).toBeCloseTo(water, 6);
        },
      ),
    );
  });
});

const baseLine = { flow: 100, flowUnit: "gpm" as const, basis: "water" as const, percent: 3, minutes: 10 };
