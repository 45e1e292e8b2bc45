import { GRAMS_PER_POUND, LITRES_PER_US_GALLON } from "./units";
import type { PfasContentUnit, RqAnswer, RqSubstance } from "./vocabulary";

/**
 * Density assumed when a content is given as % w/w: 1 kg per litre of concentrate. The legacy
 * PFOS AFFF figures "0.5–1.5 % w/w, about 5–15 g/L" imply this (an old product safety sheet;
 * academic measurements from memory); a denser concentrate makes the estimate slightly low.
 */
export const ASSUMED_CONCENTRATE_KG_PER_L = 1;

/** Grams per litre of concentrate for a content stated on concentrate; null for a foam-solution unit. */
export function pfasGramsPerLitre(content: number, unit: PfasContentUnit): number | null {
  switch (unit) {
    case "g_per_l":
      return content;
    case "mg_per_l":
      return content / 1000;
    case "percent_w_w":
      return (content / 100) * ASSUMED_CONCENTRATE_KG_PER_L * 1000;
    case "mg_per_kg":
      return (content / 1000) * ASSUMED_CONCENTRATE_KG_PER_L;
    case "mg_per_l_solution":
    case "ng_per_l_solution":
      return null;
  }
}

/**
 * Estimated mass in grams for a content stated in `unit`: a unit on concentrate applies to the
 * concentrate, a unit on foam solution (a lab result on the solution) to the solution.
 */
export function pfasGrams(
  volumes: { concentrateGal: number; solutionGal: number },
  content: number,
  unit: PfasContentUnit,
): number {
  const perLitreOfConcentrate = pfasGramsPerLitre(content, unit);
  if (perLitreOfConcentrate !== null) return volumes.concentrateGal * LITRES_PER_US_GALLON * perLitreOfConcentrate;
  const perLitreOfSolution = unit === "mg_per_l_solution" ? content / 1000 : content / 1e9;
  return volumes.solutionGal * LITRES_PER_US_GALLON * perLitreOfSolution;
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

/** A substance's content in a product, or null where it is not known. */
export type SubstanceContent = { content: number; unit: PfasContentUnit } | null;

/** One PFAS-containing product's use in one event, as the reportable-quantity check takes it. */
export type PfasUse = {
  /** The discharge's start where given, else the event's start. */
  at: Date;
  concentrateGal: number;
  solutionGal: number;
  /** Share of the foam solution that reached any surface, land included (40 CFR 302.3), 0–1. */
  grossShare: number;
  /** Share not contained and recovered, 0–1. */
  netShare: number;
  content: Record<RqSubstance, SubstanceContent>;
};

export type SubstanceMass = {
  /** Pounds that reached a surface; null when the content is not known. */
  grossPounds: number | null;
  /** Pounds not recovered; null when the content is not known. */
  netPounds: number | null;
};

/** Gross and net pounds of one substance in one use. */
export function substanceMass(use: PfasUse, substance: RqSubstance): SubstanceMass {
  const stated = use.content[substance];
  if (!stated) return { grossPounds: null, netPounds: null };
  const pounds = gramsToPoundsMass(pfasGrams(use, stated.content, stated.unit));
  return { grossPounds: pounds * use.grossShare, netPounds: pounds * use.netShare };
}

export type WindowAnswer = {
  answer: RqAnswer;
  /** Heaviest known gross pounds in a 24-hour period holding this use. */
  windowPounds: number;
  /** Uses of unknown content in such a period (the mixture rule makes the answer Unknown). */
  unknownInWindow: number;
};

/**
 * The reportable-quantity answer for each use and one substance: the RQ (1 lb in any 24-hour period,
 * 40 CFR 302.4 as amended by 89 FR 39124) is run for PFOA and for PFOS separately and never added
 * across them (40 CFR 302.6). A 24-hour period is any span shorter than 24 h: every span holding a use
 * can slide to start at one of the uses it holds. Where a use in such a span has no known content,
 * its amount cannot be compared: by the mixture rule (40 CFR 302.6(b)(1)(ii)) the whole mixture
 * released is compared with the RQ, so the answer is "unknown", never "no", unless the known mass
 * alone reaches the RQ. Gross mass is compared: runoff onto land is a release even if recovered
 * later (40 CFR 302.3).
 */
export function reportableQuantityAnswers(
  uses: readonly PfasUse[],
  substance: RqSubstance,
  thresholdLb: number,
  hours = 24,
): WindowAnswer[] {
  const span = hours * 3_600_000;
  const masses = uses.map((use) => substanceMass(use, substance).grossPounds);
  const starts = uses.map((use) => use.at.getTime());
  // Uses in time order. Every 24-hour span worth checking starts at a use and holds the uses from
  // the first at its start up to the first a full span later; uses at the same instant share it.
  const order = starts.map((_at, index) => index).sort((a, b) => starts[a] - starts[b] || a - b);
  const pounds = new Array<number>(order.length);
  const unknown = new Array<number>(order.length);
  let first = 0;
  let end = 0;
  for (let position = 0; position < order.length; position++) {
    const start = starts[order[position]];
    while (starts[order[first]] < start) first++;
    while (end < order.length && starts[order[end]] - start < span) end++;
    // Summed in the uses' own order, as the answer has always added them.
    const members = order.slice(first, end).sort((a, b) => a - b);
    let known = 0;
    let unknowns = 0;
    for (const member of members) {
      if (masses[member] === null) unknowns++;
      else known += masses[member]!;
    }
    pounds[position] = known;
    unknown[position] = unknowns;
  }
  // A use lies in every span that starts at most a span before it and no later than it: a run of
  // positions whose both ends only move forward, so the heaviest is kept with two sliding maxima.
  const heaviestPounds = slidingMaxima(order, starts, span, pounds);
  const mostUnknown = slidingMaxima(order, starts, span, unknown);
  const answers = new Array<WindowAnswer>(uses.length);
  order.forEach((useIndex, position) => {
    const windowPounds = Math.max(0, heaviestPounds[position]);
    const unknownInWindow = Math.max(0, mostUnknown[position]);
    const answer: RqAnswer = windowPounds >= thresholdLb ? "yes" : unknownInWindow > 0 ? "unknown" : "no";
    answers[useIndex] = { answer, windowPounds, unknownInWindow };
  });
  return answers;
}

/**
 * For each position in time order, the largest `values[p]` over the spans p that hold it: those
 * starting after `span` before it and at or before it (uses at the same instant included).
 */
function slidingMaxima(order: number[], starts: number[], span: number, values: number[]): number[] {
  const maxima = new Array<number>(order.length);
  const kept: number[] = [];
  let next = 0;
  for (let position = 0; position < order.length; position++) {
    const at = starts[order[position]];
    while (next < order.length && starts[order[next]] <= at) {
      while (kept.length && values[kept[kept.length - 1]] <= values[next]) kept.pop();
      kept.push(next++);
    }
    while (starts[order[kept[0]]] <= at - span) kept.shift();
    maxima[position] = values[kept[0]];
  }
  return maxima;
}

/** The worse of two answers: yes before unknown before no. */
export function worseAnswer(a: RqAnswer, b: RqAnswer): RqAnswer {
  if (a === "yes" || b === "yes") return "yes";
  if (a === "unknown" || b === "unknown") return "unknown";
  return "no";
}
