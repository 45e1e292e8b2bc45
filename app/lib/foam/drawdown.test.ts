import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  conservativeConcentrate,
  drawdownComparisons,
  DRAWDOWN_EXCESS_MIN_GAL,
  type ConcentrateLine,
} from "./drawdown";
import type { TankReading } from "./totals";

const ENGINE = 1;
const TENDER = 2;
const LEGACY = 10;
const CLASS_A = 11;

const reading = (spec: Partial<TankReading>): TankReading => ({
  apparatusId: null,
  productId: null,
  refillGal: null,
  levelBeforeGal: null,
  levelAfterGal: null,
  ...spec,
});

describe("tank drawdown beside computed concentrate", () => {
  const lines: ConcentrateLine[] = [
    { apparatusId: ENGINE, productId: LEGACY, concentrateGal: 90 },
    { apparatusId: ENGINE, productId: LEGACY, concentrateGal: 3 },
    { apparatusId: TENDER, productId: LEGACY, concentrateGal: 20 },
  ];

  it("takes a refill larger than the computed concentrate as the conservative figure", () => {
    const readings = [reading({ apparatusId: ENGINE, productId: LEGACY, refillGal: 120 })];
    expect(conservativeConcentrate(lines, readings, LEGACY)).toEqual({
      computedGal: 113,
      drawdownGal: 120,
      // The engine's 93 gal become 120 gal; the tender's 20 gal stay as computed.
      conservativeGal: 140,
      basis: "tank-drawdown",
    });
  });

  it("keeps the computed figure when the tank says less left it", () => {
    const readings = [reading({ apparatusId: ENGINE, productId: LEGACY, levelBeforeGal: 150, levelAfterGal: 70 })];
    expect(conservativeConcentrate(lines, readings, LEGACY)).toEqual({
      computedGal: 113,
      drawdownGal: 80,
      conservativeGal: 113,
      basis: "computed",
    });
  });

  it("keeps the computed figure when there is no reading, or the reading is another product's", () => {
    expect(conservativeConcentrate(lines, [], LEGACY)).toMatchObject({ drawdownGal: null, basis: "computed" });
    const other = [reading({ apparatusId: ENGINE, productId: CLASS_A, refillGal: 500 })];
    expect(conservativeConcentrate(lines, other, LEGACY)).toMatchObject({ conservativeGal: 113, basis: "computed" });
  });

  it("counts a reading without a product only where every discharge it covers used this product", () => {
    const unnamed = [reading({ apparatusId: TENDER, refillGal: 30 })];
    expect(conservativeConcentrate(lines, unnamed, LEGACY)).toMatchObject({
      conservativeGal: 123,
      basis: "tank-drawdown",
    });
    const mixed: ConcentrateLine[] = [...lines, { apparatusId: TENDER, productId: CLASS_A, concentrateGal: 1 }];
    expect(conservativeConcentrate(mixed, unnamed, LEGACY)).toMatchObject({ conservativeGal: 113, basis: "computed" });
  });

  it("compares a reading naming no apparatus with the product's whole computed concentrate", () => {
    const whole = [reading({ productId: LEGACY, refillGal: 118 })];
    expect(conservativeConcentrate(lines, whole, LEGACY)).toMatchObject({
      conservativeGal: 118,
      basis: "tank-drawdown",
    });
  });

  it("treats a difference below a hundredth of a gallon as rounding", () => {
    const readings = [reading({ apparatusId: TENDER, productId: LEGACY, refillGal: 20.004 })];
    expect(conservativeConcentrate(lines, readings, LEGACY).basis).toBe("computed");
  });

  it("lists each tank's drawdown beside what was computed for it", () => {
    const readings = [
      reading({ apparatusId: ENGINE, productId: LEGACY, refillGal: 60 }),
      reading({ apparatusId: ENGINE, productId: LEGACY, refillGal: 60 }),
      reading({ apparatusId: TENDER, productId: LEGACY, levelBeforeGal: 40, levelAfterGal: 25 }),
      reading({ apparatusId: TENDER }),
    ];
    expect(drawdownComparisons(lines, readings)).toEqual([
      { apparatusId: ENGINE, productId: LEGACY, computedGal: 93, drawdownGal: 120, drawdownExceeds: true },
      { apparatusId: TENDER, productId: LEGACY, computedGal: 20, drawdownGal: 15, drawdownExceeds: false },
    ]);
  });

  it("never carries less than computed, nor less than any one tank's drawdown beyond rounding (property)", () => {
    const line = fc.record({
      apparatusId: fc.constantFrom(ENGINE, TENDER),
      productId: fc.constantFrom(LEGACY, CLASS_A),
      concentrateGal: fc.double({ min: 0, max: 500, noNaN: true }),
    });
    const refill = fc.record({
      apparatusId: fc.constantFrom(ENGINE, TENDER),
      productId: fc.constant(LEGACY),
      refillGal: fc.double({ min: 0, max: 500, noNaN: true }),
    });
    fc.assert(
      fc.property(fc.array(line, { maxLength: 6 }), fc.array(refill, { maxLength: 3 }), (lineList, refills) => {
        const readings = refills.map((spec) => reading(spec));
        const result = conservativeConcentrate(lineList, readings, LEGACY);
        expect(result.conservativeGal).toBeGreaterThanOrEqual(result.computedGal - 1e-9);
        for (const comparison of drawdownComparisons(lineList, readings)) {
          expect(result.conservativeGal).toBeGreaterThanOrEqual(
            comparison.drawdownGal - DRAWDOWN_EXCESS_MIN_GAL - 1e-6,
          );
        }
      }),
    );
  });
});
