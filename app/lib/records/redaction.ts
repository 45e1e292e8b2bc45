/**
 * What a release package leaves out, and how locations are generalised. Pure. The choices are on
 * by default; the state's public-records law and the agency's counsel decide what may be withheld.
 */
export type RedactionChoices = {
  /** Names and contact details of personnel (authors, reviewers). */
  personnel: boolean;
  /** Narratives, internal notes and review comments. */
  notes: boolean;
  /** Addresses to the hundred block, coordinates to 3 decimals (about 100 m). */
  locations: boolean;
};

export const DEFAULT_REDACTIONS: RedactionChoices = { personnel: true, notes: true, locations: true };

/** "1234 Elm St" → "1200 block of Elm St"; an address without a house number is kept. */
export function hundredBlock(address: string): string {
  const match = /^\s*(\d+)[A-Za-z]?(?:-\d+)?\s+(.+)$/.exec(address);
  if (!match) return address.trim();
  const block = Math.floor(Number(match[1]) / 100) * 100;
  return `${block} block of ${match[2].trim()}`;
}

/**
 * 3 decimals of a degree: 0.001° of latitude is about 111 m (1° ≈ 111.32 km on the WGS 84
 * equator; common practice, no source), the "about 100 m" of the redaction rule.
 */
export function roundCoordinate(value: number | null): number | null {
  return value === null ? null : Math.round(value * 1000) / 1000;
}

export const WITHHELD = "[withheld]";
