import { DEFAULT_DRAWDOWN_TOLERANCE_SHARE } from "../agency-settings-form";
import { flowInGpm, volumeFromGallons, type FlowUnit, type Volume } from "./units";
import {
  defaultPercentOf,
  FOAM_CLASS_LABELS,
  PERCENT_OF_LABELS,
  type EventKind,
  type FlowBasis,
  type FoamClass,
  type PercentOf,
  type ProportionerType,
} from "./vocabulary";

export type DischargeInput = {
  flow: number;
  flowUnit: FlowUnit;
  /** What the flow figure measures: water before injection, or foam solution (nozzle/eductor rating). */
  basis: FlowBasis;
  /** Concentrate as a percentage (3 means 3 %); null for a water-only line. */
  percent: number | null;
  /** What the percentage is a share of; when absent, the apparatus's proportioner or the basis decides. */
  percentOf?: PercentOf | null;
  minutes: number;
  productId?: number | null;
  apparatusId?: number | null;
  /** The outlet the line flowed from: it names the foam system when `foamSystemId` is not given. */
  outlet?: string | null;
  foamSystemId?: number | null;
  startedAt?: Date | null;
  endedAt?: Date | null;
};

/**
 * Typed minutes may differ from the start and end times by the rounding of a clock read to the
 * minute; more than this is a disagreement worth a warning (common practice, no source).
 */
export const DURATION_TOLERANCE_MINUTES = 1;

/** Minutes between two instants (so a daylight-saving change is counted as it happened), or null. */
export function spanMinutes(start?: Date | null, end?: Date | null): number | null {
  if (!start || !end) return null;
  return (end.getTime() - start.getTime()) / 60_000;
}

export type ProductFacts = {
  id: number;
  name: string;
  foamClass: FoamClass;
  nominalPercents: number[];
  pfasContaining: boolean;
};

export type ApparatusFacts = {
  id: number;
  unitId: string;
  proportionerMaxConcentrateGpm: number | null;
  proportionerType?: ProportionerType | null;
  waterFlowMinGpm: number | null;
  waterFlowMaxGpm: number | null;
};

/** A foam system's limits and its spans out of tolerance (a failed test until the passing retest). */
export type FoamSystemFacts = {
  id: number;
  apparatusId: number;
  name: string;
  active: boolean;
  percentOf: PercentOf;
  minConcentrateGpm: number | null;
  maxConcentrateGpm: number | null;
  waterFlowMinGpm: number | null;
  waterFlowMaxGpm: number | null;
  /** Outlet names it serves on its apparatus. */
  outlets: string[];
  outOfTolerance: Array<{ from: Date; to: Date | null; reason: string }>;
};

/**
 * The system a line flowed through: the one named, else the one serving its outlet, else the
 * apparatus's only active system; null when none or several could be meant.
 */
export function foamSystemFor(
  input: Pick<DischargeInput, "apparatusId" | "outlet" | "foamSystemId">,
  systems: ReadonlyMap<number, FoamSystemFacts> | undefined,
): FoamSystemFacts | null {
  if (!systems) return null;
  if (input.foamSystemId != null) return systems.get(input.foamSystemId) ?? null;
  if (input.apparatusId == null) return null;
  const own = [...systems.values()].filter((system) => system.apparatusId === input.apparatusId);
  const outlet = input.outlet?.trim().toLowerCase();
  const serving = outlet ? own.find((system) => system.outlets.some((name) => name.toLowerCase() === outlet)) : null;
  if (serving) return serving;
  const active = own.filter((system) => system.active);
  return active.length === 1 ? active[0] : null;
}

export type TankReading = {
  apparatusId: number | null;
  productId: number | null;
  refillGal: number | null;
  levelBeforeGal: number | null;
  levelAfterGal: number | null;
};

export type WarningCode =
  | "percent_unusual_for_class"
  | "below_rated"
  | "proportioner_limit"
  | "proportioner_minimum"
  | "system_out_of_tolerance"
  | "flow_out_of_range"
  | "outside_event_window"
  | "duration_mismatch"
  | "pfas_non_incident_use"
  | "drawdown_mismatch";

export type UsageWarning = { code: WarningCode; message: string; field?: string };

export type Totals = {
  water: Volume;
  concentrate: Volume;
  solution: Volume;
  /** Concentrate ÷ foam solution × 100; null where no concentrate flowed. */
  effectivePercentOfSolution: number | null;
};

export type DischargeResult = Totals & {
  /** Water flow through the proportioner, gpm. */
  waterGpm: number;
  concentrateGpm: number;
  setPercent: number | null;
  /** The convention the set percentage was read in. */
  percentOf: PercentOf;
  /**
   * The percentage achieved in the setting's own convention (of water or of solution): lower than set
   * when the proportioner's maximum rate was reached.
   */
  effectivePercent: number | null;
  foamClass: FoamClass | null;
  pfasContaining: boolean;
  /** The foam system the line flowed through, where one is known. */
  foamSystemId: number | null;
  warnings: UsageWarning[];
};

export type UsageContext = {
  products?: ReadonlyMap<number, ProductFacts>;
  apparatus?: ReadonlyMap<number, ApparatusFacts>;
  /** Foam systems by id; a line's system gives its limits in place of the apparatus's own figures. */
  foamSystems?: ReadonlyMap<number, FoamSystemFacts>;
  eventWindow?: { start: Date | null; end: Date | null };
  tankReadings?: TankReading[];
  /** Largest share by which computed concentrate may differ from the tank drawdown before a warning. */
  drawdownTolerance?: number;
  /** The kind of event: PFAS-containing foam outside an incident is warned about. */
  eventKind?: EventKind;
};

/**
 * Several states ban PFAS-containing Class B foam for training and testing: Colorado, C.R.S.
 * 24-33.5-1234; California, Health & Safety Code §13062(a) (docs reference values).
 */
export const PFAS_NON_INCIDENT_WARNING =
  "PFAS-containing foam was used for training, a test or a flush. Several states ban PFAS Class B foam for such use (Colorado, C.R.S. 24-33.5-1234; California, for training, Health & Safety Code §13062); use a fluorine-free concentrate or water.";

/** The warning for PFAS-containing foam flowed outside an incident, or none. */
export function pfasNonIncidentWarnings(
  eventKind: EventKind | undefined,
  discharges: DischargeResult[],
): UsageWarning[] {
  if (!eventKind || eventKind === "incident") return [];
  const used = discharges.some((result) => result.pfasContaining && result.concentrate.gal > 0);
  return used ? [{ code: "pfas_non_incident_use", field: "kind", message: PFAS_NON_INCIDENT_WARNING }] : [];
}

/**
 * Class A: 0.1–1.0 % (fire-service training material; NFPA 1145 ranges, from memory).
 * Class B: at least the rated percent and no more than 30 % above it or 1 point above it, whichever is
 * less (NFPA 11 / UL 162 proportioning accuracy, as summarised by the trade).
 */
export function usualPercentRange(foamClass: FoamClass, nominalPercents: number[]): Array<[number, number]> {
  if (foamClass === "A") return [[0.1, 1.0]];
  const rated = nominalPercents.length ? nominalPercents : [1, 3, 6];
  return rated.map((percent) => [percent, Math.min(percent * 1.3, percent + 1)]);
}

const EPSILON = 1e-9;

function formatNumber(value: number, places = 2): string {
  return Number(value.toFixed(places)).toString();
}

/**
 * The concentrate rate a setting asks for, p as a share (3 % → 0.03):
 * - water flow, % of water: concentrate = W·p (direct injection; common practice, no source);
 * - water flow, % of solution: solution = W ÷ (1 − p), concentrate = solution − W;
 * - solution flow, % of solution: concentrate = S·p (API RP 2021 App. K; NFPA 11 §12.6.5 convention);
 * - solution flow, % of water: concentrate = S·p ÷ (1 + p).
 */
export function neededConcentrateGpm(flowGpm: number, basis: FlowBasis, percentOf: PercentOf, share: number): number {
  if (share <= 0) return 0;
  if (basis === "water") return percentOf === "water" ? flowGpm * share : flowGpm / (1 - share) - flowGpm;
  return percentOf === "solution" ? flowGpm * share : (flowGpm * share) / (1 + share);
}

/** The rating a setting aims at: the largest rated percentage not above it, else the lowest. */
function ratingFor(setPercent: number, rated: number[]): number {
  const below = rated.filter((percent) => percent <= setPercent + EPSILON);
  return below.length ? Math.max(...below) : Math.min(...rated);
}

/**
 * Class A: the set percentage against 0.1–1.0 % (fire-service training material; NFPA 1145 ranges,
 * from memory). Class B: the concentration achieved, as a percentage of foam solution, against the
 * acceptance band of NFPA 11 (2021) §12.6.5 — not less than the rated percentage, nor more than 30 %
 * above it or 1 point above it, whichever is less.
 */
function classWarnings(
  product: ProductFacts,
  setPercent: number,
  percentOf: PercentOf,
  ofSolution: number,
): UsageWarning[] {
  if (product.foamClass === "A") {
    const [[low, high]] = usualPercentRange("A", product.nominalPercents);
    if (setPercent >= low - EPSILON && setPercent <= high + EPSILON) return [];
    return [
      {
        code: "percent_unusual_for_class",
        field: "percent",
        message: `${formatNumber(setPercent)} % is outside the usual ${formatNumber(low)}–${formatNumber(high)} % for ${product.name} (${FOAM_CLASS_LABELS.A}).`,
      },
    ];
  }
  const rated = product.nominalPercents.length ? product.nominalPercents : [1, 3, 6];
  const rating = ratingFor(setPercent, rated);
  const [, high] = usualPercentRange("B", [rating])[0];
  const achieved = `${formatNumber(setPercent)} ${PERCENT_OF_LABELS[percentOf]} gives ${formatNumber(ofSolution, 3)} % of the foam solution`;
  if (ofSolution < rating - EPSILON) {
    return [
      {
        code: "below_rated",
        field: "percent",
        message: `${achieved}, below the rated ${formatNumber(rating)} % for ${product.name} — foam may not perform.`,
      },
    ];
  }
  if (ofSolution > high + EPSILON) {
    return [
      {
        code: "percent_unusual_for_class",
        field: "percent",
        message:
          `${achieved}, above the ${formatNumber(rating)}–${formatNumber(high)} % band for ${product.name} ` +
          `(${FOAM_CLASS_LABELS.B}; NFPA 11 §12.6.5, checked on the percentage of foam solution).`,
      },
    ];
  }
  return [];
}

export function computeDischarge(input: DischargeInput, context: UsageContext = {}): DischargeResult {
  const product = input.productId != null ? context.products?.get(input.productId) : undefined;
  const apparatus = input.apparatusId != null ? context.apparatus?.get(input.apparatusId) : undefined;
  const system = foamSystemFor(input, context.foamSystems);
  const warnings: UsageWarning[] = [];
  const flowGpm = flowInGpm(input.flow, input.flowUnit);
  const percentOf = input.percentOf ?? system?.percentOf ?? defaultPercentOf(input.basis, apparatus?.proportionerType);
  const setShare = input.percent ? input.percent / 100 : 0;
  const needed = neededConcentrateGpm(flowGpm, input.basis, percentOf, setShare);
  const unitLabel = system ? `${apparatus?.unitId ?? "the apparatus"} ${system.name}` : apparatus?.unitId;

  let concentrateGpm = needed;
  const maximum = system ? system.maxConcentrateGpm : apparatus?.proportionerMaxConcentrateGpm;
  const capped = maximum != null && setShare > 0 && needed > maximum + EPSILON;
  if (capped) concentrateGpm = maximum;

  // The flow figure is fixed; the other side follows from the concentrate actually injected.
  const waterGpm = input.basis === "water" ? flowGpm : flowGpm - concentrateGpm;
  const solutionGpm = input.basis === "water" ? flowGpm + concentrateGpm : flowGpm;
  const ofSolution = setShare > 0 && solutionGpm > 0 ? (concentrateGpm / solutionGpm) * 100 : null;
  const effectivePercent =
    setShare > 0
      ? capped
        ? (concentrateGpm / (percentOf === "water" ? waterGpm : solutionGpm)) * 100
        : input.percent
      : null;
  if (capped) {
    warnings.push({
      code: "proportioner_limit",
      field: "percent",
      message:
        `${formatNumber(flowGpm)} gpm at ${formatNumber(input.percent!)} ${PERCENT_OF_LABELS[percentOf]} needs ${formatNumber(needed, 3)} gpm of ` +
        `concentrate, above ${unitLabel}'s proportioner maximum of ${formatNumber(maximum, 3)} gpm: ` +
        `the effective percentage was about ${formatNumber(effectivePercent ?? 0, 3)} ${PERCENT_OF_LABELS[percentOf]}` +
        (percentOf === "water" ? ` (${formatNumber(ofSolution ?? 0, 3)} % of the foam solution).` : "."),
    });
  }

  const minimum = system?.minConcentrateGpm;
  if (minimum != null && setShare > 0 && needed < minimum - EPSILON) {
    warnings.push({
      code: "proportioner_minimum",
      field: "percent",
      message:
        `${formatNumber(flowGpm)} gpm at ${formatNumber(input.percent!)} ${PERCENT_OF_LABELS[percentOf]} needs ${formatNumber(needed, 3)} gpm of ` +
        `concentrate, below ${unitLabel}'s minimum of ${formatNumber(minimum, 3)} gpm: the proportioner may not have metered it accurately.`,
    });
  }
  if (system) warnings.push(...toleranceWarnings(system, unitLabel ?? system.name, input, context));

  const waterGal = waterGpm * input.minutes;
  const concentrateGal = concentrateGpm * input.minutes;
  const solutionGal = solutionGpm * input.minutes;

  if (product && input.percent) warnings.push(...classWarnings(product, input.percent, percentOf, ofSolution ?? 0));

  const range = system ?? apparatus;
  if (range) {
    const { waterFlowMinGpm: low, waterFlowMaxGpm: high } = range;
    if ((low != null && waterGpm < low - EPSILON) || (high != null && waterGpm > high + EPSILON)) {
      warnings.push({
        code: "flow_out_of_range",
        field: "flow",
        message: `${formatNumber(waterGpm)} gpm of water is outside ${unitLabel}'s range of ${low ?? "?"}–${high ?? "?"} gpm.`,
      });
    }
  }

  const window = context.eventWindow;
  if (window && (input.startedAt || input.endedAt)) {
    const early = input.startedAt && window.start && input.startedAt < window.start;
    const late = input.endedAt && window.end && input.endedAt > window.end;
    if (early || late) {
      warnings.push({
        code: "outside_event_window",
        field: early ? "startedAt" : "endedAt",
        message: "This discharge's times fall outside the event's start and clear times.",
      });
    }
  }

  const timed = spanMinutes(input.startedAt, input.endedAt);
  if (timed !== null && Math.abs(input.minutes - timed) > DURATION_TOLERANCE_MINUTES) {
    warnings.push({
      code: "duration_mismatch",
      field: "minutes",
      message: `The duration of ${formatNumber(input.minutes)} min does not match the ${formatNumber(timed)} min between the start and end times; the typed minutes were used.`,
    });
  }

  return {
    water: volumeFromGallons(waterGal),
    concentrate: volumeFromGallons(concentrateGal),
    solution: volumeFromGallons(solutionGal),
    waterGpm,
    concentrateGpm,
    setPercent: input.percent ? input.percent : null,
    percentOf,
    effectivePercent,
    effectivePercentOfSolution: ofSolution,
    foamClass: product?.foamClass ?? null,
    pfasContaining: product?.pfasContaining ?? false,
    foamSystemId: system?.id ?? null,
    warnings,
  };
}

/**
 * A line that flowed while its system was out of tolerance (after a failed accuracy test, before a
 * passing retest) carries a warning: its percentage, and every figure from it, may be wrong. A line
 * without a time of its own is placed at the event's start; without either, the system's present
 * state decides.
 */
function toleranceWarnings(
  system: FoamSystemFacts,
  label: string,
  input: DischargeInput,
  context: UsageContext,
): UsageWarning[] {
  const at = input.startedAt ?? context.eventWindow?.start ?? null;
  const span = system.outOfTolerance.find((item) =>
    at ? item.from <= at && (item.to == null || at < item.to) : item.to == null,
  );
  if (!span) return [];
  return [
    {
      code: "system_out_of_tolerance",
      field: "outlet",
      message: `${label} was out of tolerance (${span.reason}): the proportioned percentage, and the concentrate figures from it, may be wrong until a passing retest.`,
    },
  ];
}

export function sumTotals(items: Totals[]): Totals {
  let water = 0;
  let concentrate = 0;
  let solution = 0;
  for (const item of items) {
    water += item.water.gal;
    concentrate += item.concentrate.gal;
    solution += item.solution.gal;
  }
  return {
    water: volumeFromGallons(water),
    concentrate: volumeFromGallons(concentrate),
    solution: volumeFromGallons(solution),
    effectivePercentOfSolution: concentrate > 0 && solution > 0 ? (concentrate / solution) * 100 : null,
  };
}

function groupTotals<K>(
  inputs: DischargeInput[],
  results: DischargeResult[],
  keyOf: (input: DischargeInput, result: DischargeResult) => K,
): Array<{ key: K; totals: Totals }> {
  const groups = new Map<K, Totals[]>();
  inputs.forEach((input, index) => {
    const key = keyOf(input, results[index]);
    groups.set(key, [...(groups.get(key) ?? []), results[index]]);
  });
  return [...groups].map(([key, items]) => ({ key, totals: sumTotals(items) }));
}

export type UsageResult = {
  discharges: DischargeResult[];
  totals: Totals;
  byApparatus: Array<{ apparatusId: number | null; totals: Totals }>;
  byProduct: Array<{ productId: number | null; totals: Totals }>;
  byClass: Array<{ foamClass: FoamClass | null; totals: Totals }>;
  /** Warnings about the event as a whole, such as a tank drawdown that does not match. */
  eventWarnings: UsageWarning[];
  pfasContaining: boolean;
};

/** Water, concentrate and foam solution for every discharge of an event, with its groupings and warnings. */
export function computeUsage(inputs: DischargeInput[], context: UsageContext = {}): UsageResult {
  const discharges = inputs.map((input) => computeDischarge(input, context));
  const eventWarnings = [
    ...drawdownWarnings(inputs, discharges, context),
    ...pfasNonIncidentWarnings(context.eventKind, discharges),
  ];
  return {
    discharges,
    totals: sumTotals(discharges),
    byApparatus: groupTotals(inputs, discharges, (input) => input.apparatusId ?? null).map(({ key, totals }) => ({
      apparatusId: key,
      totals,
    })),
    byProduct: groupTotals(inputs, discharges, (input) => input.productId ?? null).map(({ key, totals }) => ({
      productId: key,
      totals,
    })),
    byClass: groupTotals(inputs, discharges, (_input, result) => result.foamClass).map(({ key, totals }) => ({
      foamClass: key,
      totals,
    })),
    eventWarnings,
    pfasContaining: discharges.some((result) => result.pfasContaining && result.concentrate.gal > 0),
  };
}

/** The concentrate a tank lost according to a refill amount or before/after levels, or null if unknown. */
export function tankDrawdownGal(reading: TankReading): number | null {
  if (reading.refillGal != null) return reading.refillGal;
  if (reading.levelBeforeGal != null && reading.levelAfterGal != null)
    return reading.levelBeforeGal - reading.levelAfterGal;
  return null;
}

function drawdownWarnings(inputs: DischargeInput[], results: DischargeResult[], context: UsageContext): UsageWarning[] {
  const tolerance = context.drawdownTolerance ?? DEFAULT_DRAWDOWN_TOLERANCE_SHARE;
  const warnings: UsageWarning[] = [];
  for (const reading of context.tankReadings ?? []) {
    const actual = tankDrawdownGal(reading);
    if (actual == null) continue;
    const computed = inputs.reduce((sum, input, index) => {
      const sameApparatus = reading.apparatusId == null || input.apparatusId === reading.apparatusId;
      const sameProduct = reading.productId == null || input.productId === reading.productId;
      return sameApparatus && sameProduct ? sum + results[index].concentrate.gal : sum;
    }, 0);
    const larger = Math.max(Math.abs(actual), computed);
    if (larger < EPSILON) continue;
    const share = Math.abs(computed - actual) / larger;
    if (share > tolerance + EPSILON) {
      const unit = reading.apparatusId != null ? context.apparatus?.get(reading.apparatusId)?.unitId : undefined;
      warnings.push({
        code: "drawdown_mismatch",
        field: "tankReadings",
        message:
          `Computed concentrate ${formatNumber(computed)} gal differs from the tank drawdown of ${formatNumber(actual)} gal` +
          `${unit ? ` on ${unit}` : ""} by ${formatNumber(share * 100, 0)} % (more than ${formatNumber(tolerance * 100, 0)} %). ` +
          "The proportioner may need calibration.",
      });
    }
  }
  return warnings;
}
