import type { Disposition } from "./vocabulary";

/**
 * How much of a report's foam solution went where. A runoff line states either a volume or a share
 * of the event's foam solution (never both: the report form refuses a mix), so the released volume
 * of a line is its stated volume, else its share of the solution discharged.
 */
export type RunoffLine = {
  disposition: Disposition;
  sharePercent: number | null;
  volumeGal: number | null;
};

/** US gallons of foam solution that one runoff line accounts for. */
export function releasedGallons(line: Omit<RunoffLine, "disposition">, solutionGal: number): number {
  if (line.volumeGal != null) return line.volumeGal;
  return line.sharePercent != null ? (line.sharePercent / 100) * solutionGal : 0;
}

/**
 * The share (0–1) of the solution that was not contained and collected, and so may have reached
 * soil, drains or water. With no solution, or no runoff recorded, everything counts as released.
 */
export function shareNotContained(containedGal: number, solutionGal: number): number {
  return solutionGal > 0 ? Math.min(1, Math.max(0, 1 - containedGal / solutionGal)) : 1;
}

/** Gallons the lines put down as contained and collected. */
export function containedGallons(lines: readonly RunoffLine[], solutionGal: number): number {
  return lines
    .filter((line) => line.disposition === "contained")
    .reduce((total, line) => total + releasedGallons(line, solutionGal), 0);
}

/**
 * `releasedGallons` as a MariaDB expression over a runoff row and its event row (the aliases the
 * query gives `runoff_dispositions` and `events`), for totals that the database sums itself.
 */
export function releasedGallonsSql(runoff: string, event: string): string {
  return `COALESCE(${runoff}.volume_gal, ${runoff}.share_percent / 100 * ${event}.solution_gal, 0)`;
}

/**
 * Dispositions that put foam solution into the environment: soil, a storm drain, surface water, and
 * "evaporated or unknown" (one stored value, so an unknown fate counts as released: the conservative
 * reading, common practice, no source). Contained and collected runoff, and runoff sent to the
 * sanitary sewer with a notice to the treatment works, are held back; sewer runoff with no notice
 * recorded counts as released.
 */
export const ENVIRONMENT_DISPOSITIONS: readonly Disposition[] = [
  "soil",
  "storm_drain",
  "surface_water",
  "evaporated_unknown",
];

/** Whether one runoff line reached the environment (see `ENVIRONMENT_DISPOSITIONS`). */
export function reachedEnvironment(disposition: Disposition, sewerNotice: string | null | undefined): boolean {
  if (disposition === "sanitary_sewer") return !sewerNotice?.trim();
  return ENVIRONMENT_DISPOSITIONS.includes(disposition);
}

/** `reachedEnvironment` as a MariaDB condition over a runoff row alias. */
export function reachedEnvironmentSql(runoff: string): string {
  const codes = ENVIRONMENT_DISPOSITIONS.map((code) => `'${code}'`).join(", ");
  return `(${runoff}.disposition IN (${codes}) OR (${runoff}.disposition = 'sanitary_sewer' AND TRIM(COALESCE(${runoff}.sewer_notice, '')) = ''))`;
}

/** Differences smaller than this (US gal) are rounding of stated shares, not missing runoff. */
export const UNACCOUNTED_TOLERANCE_GAL = 0.01;

/**
 * Foam solution that no runoff line accounts for: the event's solution less the lines' volumes, or
 * 0 when they add up (within `UNACCOUNTED_TOLERANCE_GAL`) or exceed it. With no lines at all, the
 * whole solution is unaccounted. It counts as not contained in the PFAS figures (`shareNotContained`).
 */
export function unaccountedGallons(lines: readonly RunoffLine[], solutionGal: number): number {
  if (solutionGal <= 0) return 0;
  const stated = lines.reduce((total, line) => total + releasedGallons(line, solutionGal), 0);
  const rest = solutionGal - stated;
  return rest > UNACCOUNTED_TOLERANCE_GAL ? rest : 0;
}

/** `unaccountedGallons` as a MariaDB expression over an event row alias. */
export function unaccountedGallonsSql(event: string): string {
  const stated = `COALESCE((SELECT SUM(${releasedGallonsSql("ru", event)}) FROM runoff_dispositions ru WHERE ru.event_id = ${event}.id), 0)`;
  return `CASE WHEN ${event}.solution_gal - ${stated} > ${UNACCOUNTED_TOLERANCE_GAL} THEN ${event}.solution_gal - ${stated} ELSE 0 END`;
}
