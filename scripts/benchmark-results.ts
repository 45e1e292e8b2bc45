// The figures `npm run bench` writes to bench/results.json: each bench script replaces its own rows
// (by name) and leaves the others' as they were, so the file holds the latest figure of every row.
import { execSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import os from "node:os";

export type BenchRow = {
  name: string;
  /** What median, min and max measure: here always the ratio of the app's figure to its baseline's. */
  unit: string;
  median: number;
  min: number;
  max: number;
  /** What the app was measured against, in words. */
  baseline: string;
  /** The ratio to stay at or under. */
  goal: number;
  met: boolean;
};

const FILE = "bench/results.json";

export function machine(): string {
  const cpus = os.cpus();
  const load = os.loadavg()[0].toFixed(1);
  return `${cpus.length} cores (${cpus[0]?.model ?? "unknown"}), ${Math.round(os.totalmem() / 2 ** 30)} GiB, Node ${process.version}, load ${load} at start`;
}

function commit(): string {
  try {
    return execSync("git rev-parse --short HEAD", { encoding: "utf8" }).trim();
  } catch {
    return "unknown";
  }
}

/** The median of `values` (mean of the middle two for an even count). */
export function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
}

/** A row from paired measurements: one ratio per A/B pair, the goal met when the median is at or under it. */
export function ratioRow(name: string, ratios: number[], baseline: string, goal: number): BenchRow {
  const round = (value: number) => Math.round(value * 1000) / 1000;
  const mid = median(ratios);
  return {
    name,
    unit: "ratio to baseline",
    median: round(mid),
    min: round(Math.min(...ratios)),
    max: round(Math.max(...ratios)),
    baseline,
    goal,
    met: mid <= goal,
  };
}

export function writeResults(rows: BenchRow[], machineAtStart: string): void {
  const previous = existsSync(FILE) ? (JSON.parse(readFileSync(FILE, "utf8")) as { rows?: BenchRow[] }) : {};
  const names = new Set(rows.map((row) => row.name));
  const kept = (previous.rows ?? []).filter((row) => !names.has(row.name));
  mkdirSync("bench", { recursive: true });
  const results = { machine: machineAtStart, at: new Date().toISOString(), commit: commit(), rows: [...kept, ...rows] };
  writeFileSync(FILE, `${JSON.stringify(results, null, 2)}\n`);
  console.log(`Wrote ${FILE}`);
}
