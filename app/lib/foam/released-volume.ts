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
