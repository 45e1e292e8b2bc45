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

/**
 * What the call or session was, in the fire service's own plain words: the fires and spills an
 * incident may be, and the non-incident kinds as themselves. Beside the report number a report keeps
 * the dispatch (CAD) incident number it was toned out under.
 */
export const INCIDENT_TYPES = [
  "structure_fire",
  "vehicle_fire",
  "flammable_liquid_spill",
  "wildland",
  "hazmat",
  "training",
  "test",
  "flush",
  "other",
] as const;
export type IncidentType = (typeof INCIDENT_TYPES)[number];
export const INCIDENT_TYPE_LABELS: Record<IncidentType, string> = {
  structure_fire: "Structure fire",
  vehicle_fire: "Vehicle fire",
  flammable_liquid_spill: "Flammable-liquid spill",
  wildland: "Wildland fire",
  hazmat: "Hazmat",
  training: EVENT_KIND_LABELS.training,
  test: EVENT_KIND_LABELS.test,
  flush: EVENT_KIND_LABELS.flush,
  other: "Other",
};
/** The types each kind of event may carry; a non-incident kind is its own type (or "other"). */
export const INCIDENT_TYPES_BY_KIND: Record<EventKind, readonly IncidentType[]> = {
  incident: ["structure_fire", "vehicle_fire", "flammable_liquid_spill", "wildland", "hazmat", "other"],
  training: ["training", "other"],
  test: ["test", "other"],
  flush: ["flush", "other"],
};
/** The type a non-incident report gets when none was chosen; an incident has none of its own. */
export const DEFAULT_INCIDENT_TYPE: Record<EventKind, IncidentType | null> = {
  incident: null,
  training: "training",
  test: "test",
  flush: "flush",
};
/** What stands where a report was saved before it had a type. */
export const INCIDENT_TYPE_NOT_RECORDED = "Not recorded";

export function incidentTypeLabel(type: string | null | undefined): string {
  return type && (INCIDENT_TYPES as readonly string[]).includes(type)
    ? INCIDENT_TYPE_LABELS[type as IncidentType]
    : INCIDENT_TYPE_NOT_RECORDED;
}

/** A discharge from another agency's unit: named as typed, its foam system unknown to us. */
export const MUTUAL_AID_LABEL = "Mutual aid";

/** How a mutual-aid unit is named wherever a line's unit is shown: "Mutual aid: Cedar Ford FD E41". */
export function mutualAidUnitLabel(agency: string | null | undefined, unit: string | null | undefined): string {
  return `${MUTUAL_AID_LABEL}: ${[agency, unit].filter(Boolean).join(" ")}`;
}

/** The unit a discharge came from: our apparatus's id, another agency's unit, or null. */
export function dischargeUnitLabel(line: {
  apparatus: string | null;
  mutualAidAgency?: string | null;
  mutualAidUnit?: string | null;
}): string | null {
  return line.mutualAidAgency ? mutualAidUnitLabel(line.mutualAidAgency, line.mutualAidUnit) : line.apparatus;
}

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

/** A product's class and type in one phrase, the type left out where it only repeats the class. */
export function foamClassAndTypeLabel(foamClass: FoamClass, foamType: string): string {
  const classLabel = FOAM_CLASS_LABELS[foamClass];
  const typeLabel = (FOAM_TYPE_LABELS as Record<string, string>)[foamType] ?? foamType;
  return !typeLabel || typeLabel === classLabel ? classLabel : `${classLabel} · ${typeLabel}`;
}

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
/** The three big figures of a report: computed from what was entered, not a proportioner's readout. */
export const VOLUME_LABELS: Record<VolumeName, string> = {
  water: "Computed water",
  concentrate: "Computed concentrate",
  solution: "Computed solution",
};

/**
 * Which reports a total counts, in the same words beside every total: the quarter counts accepted
 * reports only, the map filed, returned and accepted ones, the events list those and one's own drafts.
 */
export const COUNTED_REPORTS = {
  accepted: "accepted only",
  submitted: "filed, returned and accepted",
  withDrafts: "filed, returned and accepted, including your drafts",
} as const;

/** What a reviewer should look at first on a filed report, as the "To review" queue flags it. */
export const REVIEW_FLAGS = ["pfas", "to-water", "warnings", "no-location"] as const;
export type ReviewFlag = (typeof REVIEW_FLAGS)[number];
export const REVIEW_FLAG_LABELS: Record<ReviewFlag, string> = {
  pfas: "PFAS-containing foam",
  "to-water": "Storm drain or surface water",
  warnings: "Warnings",
  "no-location": "No location",
};

/** The events list's words for what its total counts, with or without a status filter. */
export function countedReportsOfList(status: EventStatus | undefined): string {
  if (!status) return COUNTED_REPORTS.withDrafts;
  if (status === "draft") return "your drafts only";
  if (status === "accepted") return COUNTED_REPORTS.accepted;
  return `${EVENT_STATUS_LABELS[status].toLowerCase()} only`;
}

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

/** Which concentrate figure a PFAS estimate used: the computed one, or a larger tank drawdown. */
export const CONCENTRATE_FIGURES = ["computed", "tank-drawdown"] as const;
export type ConcentrateFigure = (typeof CONCENTRATE_FIGURES)[number];
export const CONCENTRATE_FIGURE_LABELS: Record<ConcentrateFigure, string> = {
  computed: "Computed from flows, times and percentages",
  "tank-drawdown": "Tank drawdown, larger than computed: conservative figure",
};

/** The two sums of runoff a regulator reads apart (see `reachedEnvironment` in released-volume.ts). */
export const RELEASED_TO_ENVIRONMENT_LABEL =
  "Released to the environment (soil, storm drain, surface water, unknown, sewer without notice)";
export const HELD_BACK_LABEL = "Held back (contained and collected, sewer with notice to the treatment works)";

/** The line for foam solution that no runoff line accounts for (`unaccountedGallons`). */
export const UNACCOUNTED_LABEL = "Unaccounted (no runoff line says where it went)";

/** How a foam system proportions (our words for the trade's kinds of proportioner). */
export const FOAM_SYSTEM_TYPES = [
  "direct_injection",
  "around_the_pump",
  "balanced_pressure",
  "inline_eductor",
  "premix",
  "other",
] as const;
export type FoamSystemType = (typeof FOAM_SYSTEM_TYPES)[number];
export const FOAM_SYSTEM_TYPE_LABELS: Record<FoamSystemType, string> = {
  direct_injection: "Direct injection",
  around_the_pump: "Around-the-pump",
  balanced_pressure: "Balanced pressure",
  inline_eductor: "Inline eductor",
  premix: "Premix",
  other: "Other",
};
/** The convention a new system's controller takes by default (as `PROPORTIONER_PERCENT_OF`). */
export const FOAM_SYSTEM_PERCENT_OF: Record<FoamSystemType, PercentOf> = {
  direct_injection: "water",
  around_the_pump: "solution",
  balanced_pressure: "solution",
  inline_eductor: "solution",
  premix: "solution",
  other: "solution",
};
export function isFoamSystemType(value: unknown): value is FoamSystemType {
  return (FOAM_SYSTEM_TYPES as readonly unknown[]).includes(value);
}

/** A system's own state: a failed accuracy test puts it out of tolerance until a passing retest. */
export const FOAM_SYSTEM_STATUSES = ["in_service", "out_of_tolerance"] as const;
export type FoamSystemStatus = (typeof FOAM_SYSTEM_STATUSES)[number];

/** Where a system stands on the fleet page and in `GET /api/foam-systems`, worst first. */
export const FLEET_STATUSES = ["out_of_tolerance", "overdue", "due_soon", "current"] as const;
export type FleetStatus = (typeof FLEET_STATUSES)[number];
export const FLEET_STATUS_LABELS: Record<FleetStatus, string> = {
  out_of_tolerance: "Out of tolerance",
  overdue: "Overdue",
  due_soon: "Due within 30 days",
  current: "Current",
};

export const MAINTENANCE_KINDS = ["flush", "prime", "strainer", "changeover"] as const;
export type MaintenanceKind = (typeof MAINTENANCE_KINDS)[number];
export const MAINTENANCE_KIND_LABELS: Record<MaintenanceKind, string> = {
  flush: "Flush",
  prime: "Prime",
  strainer: "Strainer or check valve cleaned",
  changeover: "Tank cleaned or product changed over",
};

export const FLUSH_REASONS = ["after_use", "before_change", "scheduled"] as const;
export type FlushReason = (typeof FLUSH_REASONS)[number];
export const FLUSH_REASON_LABELS: Record<FlushReason, string> = {
  after_use: "After use",
  before_change: "Before a product change",
  scheduled: "On schedule",
};

export const ACCURACY_TEST_METHODS = ["refractometer", "conductivity", "flow"] as const;
export type AccuracyTestMethod = (typeof ACCURACY_TEST_METHODS)[number];
export const ACCURACY_TEST_METHOD_LABELS: Record<AccuracyTestMethod, string> = {
  refractometer: "Refractometer (calibration curve)",
  conductivity: "Conductivity (calibration curve)",
  flow: "Flow measurement (timed concentrate draw against metered water)",
};

/** What a file attached to an event is. */
export const ATTACHMENT_KINDS = ["photo", "disposal_manifest", "lab_result", "test_printout", "other"] as const;
export type AttachmentKind = (typeof ATTACHMENT_KINDS)[number];
export const ATTACHMENT_KIND_LABELS: Record<AttachmentKind, string> = {
  photo: "Scene photo",
  disposal_manifest: "Disposal manifest",
  lab_result: "Lab result",
  test_printout: "Test printout",
  other: "Other document",
};
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
