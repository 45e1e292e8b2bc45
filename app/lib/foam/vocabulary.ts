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

export const PFAS_CONTENT_UNITS = ["g_per_l", "mg_per_l", "percent_w_w"] as const;
export type PfasContentUnit = (typeof PFAS_CONTENT_UNITS)[number];
export const PFAS_CONTENT_UNIT_LABELS: Record<PfasContentUnit, string> = {
  g_per_l: "g per litre of concentrate",
  mg_per_l: "mg per litre of concentrate",
  percent_w_w: "% by weight of concentrate (w/w)",
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

export const APPLICATION_METHODS = ["compressed_air", "aspirated", "non_aspirated", "monitor", "wetting"] as const;
export type ApplicationMethod = (typeof APPLICATION_METHODS)[number];
export const APPLICATION_METHOD_LABELS: Record<ApplicationMethod, string> = {
  compressed_air: "Compressed-air foam",
  aspirated: "Aspirated",
  non_aspirated: "Non-aspirated",
  monitor: "Monitor",
  wetting: "Wetting agent",
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
