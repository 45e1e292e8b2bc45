import { addMonths } from "../foam/system-schedule";

/**
 * The day a lot's shelf life ends (YYYY-MM-DD): its manufacture date plus the product's shelf life in
 * months, as its data sheet gives it. Null when either is not known.
 */
export function shelfLifeEnds(manufacturedOn: string | null, shelfLifeMonths: number | null): string | null {
  if (!manufacturedOn || !shelfLifeMonths) return null;
  return addMonths(manufacturedOn, shelfLifeMonths);
}

/** Whether a lot is past its shelf life on `today` (YYYY-MM-DD); a lot whose end is not known is not. */
export function pastShelfLife(manufacturedOn: string | null, shelfLifeMonths: number | null, today: string): boolean {
  const ends = shelfLifeEnds(manufacturedOn, shelfLifeMonths);
  return ends !== null && ends < today;
}
