import { tankDrawdownGal, type TankReading } from "./totals";
import type { ConcentrateFigure } from "./vocabulary";

/**
 * Tank drawdown beside computed concentrate. A refill amount or a pair of tank levels measures what
 * left the tank; the computed figure follows from entered flows, times and percentages. Where the
 * tank says more left than the computation, the larger figure is the conservative one for PFAS
 * mass estimates (common practice, no source: an estimate that could understate a release is not
 * handed to a regulator when a measured figure says more).
 */

/** One discharge as the comparison needs it: whose tank, which product, how much concentrate. */
export type ConcentrateLine = { apparatusId: number | null; productId: number | null; concentrateGal: number };

/** Differences smaller than this are rounding (stored volumes keep hundredths of a gallon at best). */
export const DRAWDOWN_EXCESS_MIN_GAL = 0.005;

export type DrawdownComparison = {
  /** The apparatus and product the readings name (null: not named, so all of them). */
  apparatusId: number | null;
  productId: number | null;
  /** Concentrate computed from the discharges the readings cover. */
  computedGal: number;
  /** What the tank readings say left the tank(s). */
  drawdownGal: number;
  /** The tank says more left than was computed. */
  drawdownExceeds: boolean;
};

type Scope = { apparatusId: number | null; productId: number | null; drawdownGal: number };

/** Readings with a known drawdown, summed per apparatus and product they name. */
function scopesOf(readings: readonly TankReading[]): Scope[] {
  const scopes = new Map<string, Scope>();
  for (const reading of readings) {
    const drawdown = tankDrawdownGal(reading);
    if (drawdown == null) continue;
    const key = `${reading.apparatusId ?? "-"}/${reading.productId ?? "-"}`;
    const scope = scopes.get(key) ?? { apparatusId: reading.apparatusId, productId: reading.productId, drawdownGal: 0 };
    scope.drawdownGal += drawdown;
    scopes.set(key, scope);
  }
  return [...scopes.values()];
}

const covers = (scope: { apparatusId: number | null; productId: number | null }, line: ConcentrateLine) =>
  (scope.apparatusId == null || line.apparatusId === scope.apparatusId) &&
  (scope.productId == null || line.productId === scope.productId);

const sumConcentrate = (lines: readonly ConcentrateLine[]) => lines.reduce((sum, line) => sum + line.concentrateGal, 0);

/** Each apparatus and product the tank readings name, its drawdown beside the computed concentrate. */
export function drawdownComparisons(
  lines: readonly ConcentrateLine[],
  readings: readonly TankReading[],
): DrawdownComparison[] {
  return scopesOf(readings).map((scope) => {
    const computedGal = sumConcentrate(lines.filter((line) => covers(scope, line)));
    return {
      ...scope,
      computedGal,
      drawdownExceeds: scope.drawdownGal - computedGal > DRAWDOWN_EXCESS_MIN_GAL,
    };
  });
}

export type ConservativeConcentrate = {
  /** Concentrate of this product computed from the discharges. */
  computedGal: number;
  /** What the tank readings attributable to this product say left the tanks; null: no such reading. */
  drawdownGal: number | null;
  /** The larger of the two, tank by tank: the figure PFAS estimates use. */
  conservativeGal: number;
  /** "tank-drawdown" when a tank reading raised the figure above the computed one. */
  basis: ConcentrateFigure;
};

/**
 * The concentrate of one product to carry into PFAS estimates. A reading counts for the product
 * when it names it, or names no product while every discharge it covers used this product. Per
 * apparatus, the larger of drawdown and computed is taken; a reading naming no apparatus compares
 * with the product's whole computed concentrate.
 */
export function conservativeConcentrate(
  lines: readonly ConcentrateLine[],
  readings: readonly TankReading[],
  productId: number,
): ConservativeConcentrate {
  const ofProduct = lines.filter((line) => line.productId === productId);
  const computedGal = sumConcentrate(ofProduct);
  const attributable = scopesOf(readings).filter((scope) => {
    if (scope.productId != null) return scope.productId === productId;
    const covered = lines.filter((line) => covers(scope, line));
    return covered.length > 0 && covered.every((line) => line.productId === productId);
  });
  if (attributable.length === 0)
    return { computedGal, drawdownGal: null, conservativeGal: computedGal, basis: "computed" };
  const drawdownGal = attributable.reduce((sum, scope) => sum + scope.drawdownGal, 0);
  let excess: number;
  if (attributable.some((scope) => scope.apparatusId == null)) {
    excess = Math.max(0, drawdownGal - computedGal);
  } else {
    const perApparatus = new Map<number, number>();
    for (const scope of attributable) {
      perApparatus.set(scope.apparatusId!, (perApparatus.get(scope.apparatusId!) ?? 0) + scope.drawdownGal);
    }
    excess = [...perApparatus].reduce((sum, [apparatusId, drawdown]) => {
      const computedHere = sumConcentrate(ofProduct.filter((line) => line.apparatusId === apparatusId));
      return sum + Math.max(0, drawdown - computedHere);
    }, 0);
  }
  const raised = excess > DRAWDOWN_EXCESS_MIN_GAL;
  return {
    computedGal,
    drawdownGal,
    conservativeGal: raised ? computedGal + excess : computedGal,
    basis: raised ? "tank-drawdown" : "computed",
  };
}
