import type { FigureBasis } from "./vocabulary";

/**
 * The short basis of a figure from the free-text note of its source, for the workbook's "Basis"
 * column: an estimate or a value recalled without a document says so; a note naming a laboratory or
 * a safety sheet is that; any other stated source is a published one. The order matters: a note that
 * calls itself an estimate is one even when it mentions a safety sheet.
 */
export function figureBasis(source: string | null | undefined): FigureBasis {
  const note = (source ?? "").trim().toLowerCase();
  if (!note) return "not_recorded";
  if (/from memory|estimate|unverified|not measured|assumed/.test(note)) return "estimate";
  if (/common practice/.test(note)) return "practice";
  if (/laborator|lab result|measured|test report|epa method|astm/.test(note)) return "measured";
  if (/safety (data )?sheet|\bsds\b/.test(note)) return "safety_sheet";
  return "published";
}
