/**
 * The words of foam use: every stored value of a report or a catalogue record, with the one label
 * that forms, lists, the map, the workbook and the CSV show. Where an export needs shorter text, a
 * named map stands beside the canonical one.
 */
import type { FlowUnit } from "./units";

export const EVENT_KINDS = ["incident", "training", "test", "flush"] as const;
export type EventKind = (typeof EVENT_KINDS)[number];
export const EVENT_KIND_LABELS: Record<EventKind, string> = {
  incident: "Incident",
  training: "Training",
  test: "Proportioner test",
  flush: "Flush or maintenance",
};

export const EVENT_STATUSES = ["draft", "filed", "returned", "accepted"] as const;
export type EventStatus = (typeof EVENT_STATUSES)[number];
export const EVENT_STATUS_LABELS: Record<EventStatus, string> = {
  draft: "Draft",
  filed: "Filed",
  returned: "Returned",
  accepted: "Accepted",
};

export const DISPOSITIONS = [
  "contained",
  "soil",
  "storm_drain",
  "surface_water",
  "sanitary_sewer",
  "evaporated_unknown",
] as const;
export type Disposition = (typeof DISPOSITIONS)[number];
export const DISPOSITION_LABELS: Record<Disposition, string> = {
  contained: "Contained and collected",
  soil: "To soil",
  storm_drain: "To a storm drain",
  surface_water: "To surface water",
  sanitary_sewer: "To the sanitary sewer",
  evaporated_unknown: "Evaporated or unknown",
};
/** Runoff that reached a drain or open water: a filed report with any of these raises a release alert. */
export const DISPOSITIONS_TO_WATER: readonly Disposition[] = ["storm_drain", "surface_water"];

export const FOAM_CLASSES = ["A", "B"] as const;
export type FoamClass = (typeof FOAM_CLASSES)[number];
export const FOAM_CLASS_LABELS: Record<FoamClass, string> = {
  A: "Class A",
  B: "Class B",
};
/** An event whose lines used both classes (the map's "A+B"). */
export const BOTH_CLASSES_LABEL = "Both classes";
/** What stands in the class or product column of a line that flowed no concentrate. */
export const WATER_ONLY_LABEL = "Water only";

/** The classes an event used, as the map sends them. */
export type EventFoamClasses = FoamClass | "A+B" | "none";

export function eventFoamClassesLabel(classes: EventFoamClasses): string {
  if (classes === "none") return WATER_ONLY_LABEL;
  return classes === "A+B" ? BOTH_CLASSES_LABEL : FOAM_CLASS_LABELS[classes];
}

/** The label of a stored foam class, or "Water only" for a line without a product. */
export function foamClassLabel(foamClass: string | null | undefined): string {
  return foamClass === "A" || foamClass === "B" ? FOAM_CLASS_LABELS[foamClass] : WATER_ONLY_LABEL;
}

export const FOAM_TYPES = [
  "class-a",
  "afff",
  "ar-afff",
  "fffp",
  "ar-fffp",
  "f3",
  "protein",
  "fluoroprotein",
  "other",
] as const;
export type FoamType = (typeof FOAM_TYPES)[number];
export const FOAM_TYPE_LABELS: Record<FoamType, string> = {
  "class-a": "Class A",
  afff: "AFFF",
  "ar-afff": "AR-AFFF (alcohol-resistant)",
  fffp: "FFFP",
  "ar-fffp": "AR-FFFP (alcohol-resistant)",
  f3: "Fluorine-free (F3)",
  protein: "Protein",
  fluoroprotein: "Fluoroprotein",
  other: "Other",
};

export const PFAS_CONTENT_UNITS = [
  "g_per_l",
  "mg_per_l",
  "percent_w_w",
  "mg_per_kg",
  "mg_per_l_solution",
  "ng_per_l_solution",
] as const;
export type PfasContentUnit = (typeof PFAS_CONTENT_UNITS)[number];
export const PFAS_CONTENT_UNIT_LABELS: Record<PfasContentUnit, string> = {
  g_per_l: "g per litre of concentrate",
  mg_per_l: "mg per litre of concentrate",
  percent_w_w: "% by weight of concentrate (w/w)",
  mg_per_kg: "mg per kg of concentrate",
  mg_per_l_solution: "mg per litre of foam solution",
  ng_per_l_solution: "ng per litre of foam solution",
};
/** Content units measured on foam solution (a lab result on solution is not read as concentrate). */
export const PFAS_SOLUTION_UNITS: readonly PfasContentUnit[] = ["mg_per_l_solution", "ng_per_l_solution"];

/**
 * The substances a CERCLA reportable quantity counts: PFOA and PFOS, each with its salts and
 * structural isomers (89 FR 39124, 40 CFR 302.4). Total PFAS is a screening figure only.
 */
export const RQ_SUBSTANCES = ["pfoa", "pfos"] as const;
export type RqSubstance = (typeof RQ_SUBSTANCES)[number];
export const RQ_SUBSTANCE_LABELS: Record<RqSubstance, string> = {
  pfoa: "PFOA (with its salts and structural isomers)",
  pfos: "PFOS (with its salts and structural isomers)",
};
export const RQ_SUBSTANCE_SHORT_LABELS: Record<RqSubstance, string> = { pfoa: "PFOA", pfos: "PFOS" };

/** The answer to "does this reach the reportable quantity?": never "No" when it cannot be known. */
export const RQ_ANSWERS = ["yes", "no", "unknown"] as const;
export type RqAnswer = (typeof RQ_ANSWERS)[number];
export const RQ_ANSWER_LABELS: Record<RqAnswer, string> = {
  yes: "Yes",
  no: "No",
  unknown: "Unknown — content not known (mixture rule, 40 CFR 302.6(b)(1)(ii))",
};

export function isPfasContentUnit(value: unknown): value is PfasContentUnit {
  return (PFAS_CONTENT_UNITS as readonly unknown[]).includes(value);
}

/** The three volumes every discharge and every report is totalled in. */
export const VOLUMES = ["water", "concentrate", "solution"] as const;
export type VolumeName = (typeof VOLUMES)[number];
export const VOLUME_LABELS: Record<VolumeName, string> = {
  water: "Water",
  concentrate: "Concentrate",
  solution: "Foam solution",
};

export const FLOW_UNIT_LABELS: Record<FlowUnit, string> = {
  gpm: "gpm",
  lpm: "L/min",
};

export const FLOW_BASES = ["water", "solution"] as const;
export type FlowBasis = (typeof FLOW_BASES)[number];
export const FLOW_BASIS_LABELS: Record<FlowBasis, string> = {
  water: "Water flow (direct injection)",
  solution: "Foam solution (nozzle or eductor rating)",
};
/** The flow basis in an export's column, where the explanation would not fit. */
export const FLOW_BASIS_EXPORT_LABELS: Record<FlowBasis, string> = {
  water: "Water",
  solution: "Foam solution",
};

/**
 * What a percentage setting is a share of. NFPA 11 (2021) §12.6.5 states the proportioning rate as a
 * percentage of the foam solution flow; direct-injection controllers meter water and inject the set
 * share of the water flow (common practice, no source).
 */
export const PERCENT_OF = ["solution", "water"] as const;
export type PercentOf = (typeof PERCENT_OF)[number];
export const PERCENT_OF_LABELS: Record<PercentOf, string> = {
  solution: "% of the foam solution",
  water: "% of the water flow",
};
/** The same, in an export's column. */
export const PERCENT_OF_EXPORT_LABELS: Record<PercentOf, string> = {
  solution: "Of foam solution",
  water: "Of water",
};

export const PROPORTIONER_TYPES = [
  "direct_injection",
  "eductor",
  "around_the_pump",
  "balanced_pressure",
  "premix",
] as const;
export type ProportionerType = (typeof PROPORTIONER_TYPES)[number];
export const PROPORTIONER_TYPE_LABELS: Record<ProportionerType, string> = {
  direct_injection: "Direct injection",
  eductor: "Eductor (in-line inductor)",
  around_the_pump: "Around-the-pump",
  balanced_pressure: "Balanced pressure",
  premix: "Premix",
};
/**
 * A direct-injection controller sets a share of the water it meters; the others set a share of the
 * solution they make (NFPA 11 §12.6.5 convention; direct injection: common practice, no source).
 */
export const PROPORTIONER_PERCENT_OF: Record<ProportionerType, PercentOf> = {
  direct_injection: "water",
  eductor: "solution",
  around_the_pump: "solution",
  balanced_pressure: "solution",
  premix: "solution",
};

export function isProportionerType(value: unknown): value is ProportionerType {
  return (PROPORTIONER_TYPES as readonly unknown[]).includes(value);
}

/**
 * The convention a line takes when none was chosen: its apparatus's proportioner, else the flow basis
 * (a water figure with a share of water, a solution rating with a share of solution).
 */
export function defaultPercentOf(basis: FlowBasis, proportionerType?: ProportionerType | null): PercentOf {
  if (proportionerType) return PROPORTIONER_PERCENT_OF[proportionerType];
  return basis === "water" ? "water" : "solution";
}

export const APPLICATION_METHODS = ["compressed_air", "aspirated", "non_aspirated", "monitor", "wetting"] as const;
export type ApplicationMethod = (typeof APPLICATION_METHODS)[number];
export const APPLICATION_METHOD_LABELS: Record<ApplicationMethod, string> = {
  compressed_air: "Compressed-air foam",
  aspirated: "Aspirated",
  non_aspirated: "Non-aspirated",
  monitor: "Monitor",
  wetting: "Wetting agent",
};

/** Who was told of a release: a notification record kept beside the report (the report is not one). */
export const NOTIFIED_PARTIES = [
  "national_response_center",
  "state_spill_line",
  "local_sewer_authority",
  "other",
] as const;
export type NotifiedParty = (typeof NOTIFIED_PARTIES)[number];
export const NOTIFIED_PARTY_LABELS: Record<NotifiedParty, string> = {
  national_response_center: "National Response Center (federal)",
  state_spill_line: "State spill line",
  local_sewer_authority: "Local sewer authority (treatment works)",
  other: "Other",
};
/** Where a public-records request stands (our own words). */
export const RECORDS_REQUEST_STATUSES = [
  "received",
  "in_progress",
  "fulfilled",
  "partly_withheld",
  "withheld",
  "withdrawn",
] as const;
export type RecordsRequestStatus = (typeof RECORDS_REQUEST_STATUSES)[number];
export const RECORDS_REQUEST_STATUS_LABELS: Record<RecordsRequestStatus, string> = {
  received: "Received",
  in_progress: "In progress",
  fulfilled: "Fulfilled",
  partly_withheld: "Partly withheld",
  withheld: "Withheld",
  withdrawn: "Withdrawn",
};
/** Statuses that close a request: its due date no longer runs. */
export const RECORDS_REQUEST_CLOSED: readonly RecordsRequestStatus[] = [
  "fulfilled",
  "partly_withheld",
  "withheld",
  "withdrawn",
];

/**
 * How well a catalogue figure is backed, in the short words the workbook gives a regulator in its
 * "Basis" column; the catalogue keeps the full note of where the figure came from.
 */
export const FIGURE_BASES = ["measured", "safety_sheet", "published", "practice", "estimate", "not_recorded"] as const;
export type FigureBasis = (typeof FIGURE_BASES)[number];
export const FIGURE_BASIS_LABELS: Record<FigureBasis, string> = {
  measured: "Laboratory result",
  safety_sheet: "Product safety sheet",
  published: "Published source",
  practice: "Common practice, no published source",
  estimate: "Estimate, not verified",
  not_recorded: "Not recorded",
};

/** The two sums of runoff a regulator reads apart (see `reachedEnvironment` in released-volume.ts). */
export const RELEASED_TO_ENVIRONMENT_LABEL =
  "Released to the environment (soil, storm drain, surface water, unknown, sewer without notice)";
export const HELD_BACK_LABEL = "Held back (contained and collected, sewer with notice to the treatment works)";

/** The line for foam solution that no runoff line accounts for (`unaccountedGallons`). */
export const UNACCOUNTED_LABEL = "Unaccounted (no runoff line says where it went)";

// ---------------------------------------------------------------------------------------------
// The stock book

export const STOCK_LOCATION_KINDS = ["station_store", "apparatus_tank", "foam_tender", "cache"] as const;
export type StockLocationKind = (typeof STOCK_LOCATION_KINDS)[number];
export const STOCK_LOCATION_KIND_LABELS: Record<StockLocationKind, string> = {
  station_store: "Station store",
  apparatus_tank: "Apparatus tank",
  foam_tender: "Foam tender",
  cache: "Cache",
};

export const STOCK_MOVEMENT_KINDS = ["received", "transferred", "used", "sampled", "disposed", "adjusted"] as const;
export type StockMovementKind = (typeof STOCK_MOVEMENT_KINDS)[number];
export const STOCK_MOVEMENT_KIND_LABELS: Record<StockMovementKind, string> = {
  received: "Received",
  transferred: "Transferred",
  used: "Used on a report",
  sampled: "Quality sample",
  disposed: "Sent for disposal",
  adjusted: "Count adjustment",
};

export const STOCK_CONTAINERS = ["pail", "drum", "tote", "bulk"] as const;
export type StockContainer = (typeof STOCK_CONTAINERS)[number];
export const STOCK_CONTAINER_LABELS: Record<StockContainer, string> = {
  pail: "Pail",
  drum: "Drum",
  tote: "Tote",
  bulk: "Bulk",
};

/** What a product held for disposal is called wherever it is listed. */
export const HELD_FOR_DISPOSAL_LABEL = "Held for disposal";
/** What stands in the lot column for concentrate whose lot the book does not know. */
export const UNKNOWN_LOT_LABEL = "Lot not known";
