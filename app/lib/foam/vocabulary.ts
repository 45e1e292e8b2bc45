/** The words of foam use that forms, lists and exports share. */

export const FLOW_BASES = ["water", "solution"] as const;
export type FlowBasisName = (typeof FLOW_BASES)[number];
export const FLOW_BASIS_LABELS: Record<FlowBasisName, string> = {
  water: "Water flow (direct injection)",
  solution: "Foam solution (nozzle or eductor rating)",
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
