/** 1 US gallon = 231 in³ = 3.785411784 L exactly (NIST Handbook 44, Appendix C). */
export const LITRES_PER_US_GALLON = 3.785411784;

/** 1 lb = 0.45359237 kg exactly (NIST Handbook 44, Appendix C). */
export const KILOGRAMS_PER_POUND = 0.45359237;
export const GRAMS_PER_POUND = KILOGRAMS_PER_POUND * 1000;

export type Volume = { gal: number; L: number };

export function gallonsToLitres(gallons: number): number {
  return gallons * LITRES_PER_US_GALLON;
}

export function litresToGallons(litres: number): number {
  return litres / LITRES_PER_US_GALLON;
}

export function volumeFromGallons(gallons: number): Volume {
  return { gal: gallons, L: gallonsToLitres(gallons) };
}

export type FlowUnit = "gpm" | "lpm";
export const FLOW_UNITS: readonly FlowUnit[] = ["gpm", "lpm"];

/** A flow in US gallons per minute, whatever unit it was entered in. */
export function flowInGpm(flow: number, unit: FlowUnit): number {
  return unit === "gpm" ? flow : litresToGallons(flow);
}

/** Rounds for display only; stored and computed values keep full precision. */
export function roundForDisplay(value: number, places = 2): number {
  const factor = 10 ** places;
  return Math.round((value + Number.EPSILON * Math.sign(value)) * factor) / factor;
}
