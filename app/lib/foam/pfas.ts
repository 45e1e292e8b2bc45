import { GRAMS_PER_POUND, LITRES_PER_US_GALLON } from "./units";
import type { PfasContentUnit } from "./vocabulary";

/**
 * Density assumed when a content is given as % w/w: 1 kg per litre of concentrate. The legacy
 * PFOS AFFF figures "0.5–1.5 % w/w, about 5–15 g/L" imply this (an old product safety sheet;
 * academic measurements from memory); a denser concentrate makes the estimate slightly low.
 */
export const ASSUMED_CONCENTRATE_KG_PER_L = 1;

/** Grams of PFAS per litre of concentrate for a content stated in `unit`. */
export function pfasGramsPerLitre(content: number, unit: PfasContentUnit): number {
  switch (unit) {
    case "g_per_l":
      return content;
    case "mg_per_l":
      return content / 1000;
    case "percent_w_w":
      return (content / 100) * ASSUMED_CONCENTRATE_KG_PER_L * 1000;
  }
}

/** Estimated PFAS mass in grams in `concentrateGal` US gallons of concentrate. */
export function pfasGrams(concentrateGal: number, content: number, unit: PfasContentUnit): number {
  return concentrateGal * LITRES_PER_US_GALLON * pfasGramsPerLitre(content, unit);
}

export function gramsToPoundsMass(grams: number): number {
  return grams / GRAMS_PER_POUND;
}

export type TimedMass = { at: Date; pounds: number };

/**
 * For each release, the total mass released in the 24 hours that begin with it (releases at or
 * after it and less than 24 h later). The largest of these is the heaviest 24-hour period: any
 * window holding a set of releases can slide forward to start at the first of them.
 */
export function rollingWindowTotals(releases: readonly TimedMass[], hours = 24): number[] {
  const order = releases
    .map((release, index) => ({ ...release, index }))
    .sort((a, b) => a.at.getTime() - b.at.getTime());
  const totals = new Array<number>(releases.length).fill(0);
  const span = hours * 3_600_000;
  let end = 0;
  let running = 0;
  for (let start = 0; start < order.length; start++) {
    while (end < order.length && order[end].at.getTime() - order[start].at.getTime() < span) {
      running += order[end].pounds;
      end++;
    }
    totals[order[start].index] = running;
    running -= order[start].pounds;
  }
  return totals;
}
