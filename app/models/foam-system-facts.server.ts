// What the usage computation needs to know of foam systems: limits, outlets served, and the spans
// each was out of tolerance (from a failed accuracy test to the next passing one). Relative imports
// and a connection passed in, so that the seeds can read them too.
import type { Knex } from "knex";
import { decimalOrNull } from "../lib/decimal";
import type { FoamSystemFacts } from "../lib/foam/totals";
import type { PercentOf } from "../lib/foam/vocabulary";

type Connection = Knex | Knex.Transaction;

/** Spans out of tolerance from a system's tests in time order: each failure opens one, a pass closes it. */
export function toleranceSpans(
  tests: ReadonlyArray<{ testedAt: Date; pass: boolean; reason: string }>,
): FoamSystemFacts["outOfTolerance"] {
  const spans: FoamSystemFacts["outOfTolerance"] = [];
  let open: FoamSystemFacts["outOfTolerance"][number] | null = null;
  for (const test of [...tests].sort((a, b) => a.testedAt.getTime() - b.testedAt.getTime())) {
    if (!test.pass && !open) {
      open = { from: test.testedAt, to: null, reason: test.reason };
      spans.push(open);
    } else if (test.pass && open) {
      open.to = test.testedAt;
      open = null;
    }
  }
  return spans;
}

/** A failed test's reason as the warning quotes it. */
export function failureReason(achievedPercent: number, band: readonly [number, number], testedOn: string): string {
  const figure = (value: number) => Number(value.toFixed(3)).toString();
  return `accuracy test of ${testedOn}: ${figure(achievedPercent)} % of solution, outside ${figure(band[0])}–${figure(band[1])} %`;
}

/** Facts of the systems on the given apparatus, or of every system when `apparatusIds` is omitted. */
export async function foamSystemFactsMap(
  connection: Connection,
  apparatusIds?: Iterable<number>,
): Promise<Map<number, FoamSystemFacts>> {
  const wanted = apparatusIds ? [...new Set(apparatusIds)] : null;
  const map = new Map<number, FoamSystemFacts>();
  if (wanted && wanted.length === 0) return map;
  const systems: Array<Record<string, unknown> & { id: number; apparatus_id: number; name: string }> = await connection(
    "foam_systems",
  ).modify((query) => {
    if (wanted) query.whereIn("apparatus_id", wanted);
  });
  if (systems.length === 0) return map;
  const ids = systems.map((row) => row.id);
  const [outlets, tests] = await Promise.all([
    connection("foam_system_outlets").whereIn("foam_system_id", ids).select("foam_system_id", "outlet_name"),
    connection("foam_accuracy_tests")
      .whereIn("foam_system_id", ids)
      .orderBy(["tested_at", "id"])
      .select("foam_system_id", "tested_at", "pass", "achieved_percent", "band_low", "band_high"),
  ]);
  for (const row of systems) {
    const own = tests.filter((test) => test.foam_system_id === row.id);
    map.set(row.id, {
      id: row.id,
      apparatusId: row.apparatus_id,
      name: row.name,
      active: Boolean(row.active),
      percentOf: (row.percent_of as PercentOf) ?? "solution",
      minConcentrateGpm: decimalOrNull(row.min_concentrate_gpm),
      maxConcentrateGpm: decimalOrNull(row.max_concentrate_gpm),
      waterFlowMinGpm: decimalOrNull(row.water_flow_min_gpm),
      waterFlowMaxGpm: decimalOrNull(row.water_flow_max_gpm),
      outlets: outlets.filter((outlet) => outlet.foam_system_id === row.id).map((outlet) => outlet.outlet_name),
      outOfTolerance: toleranceSpans(
        own.map((test) => {
          const testedAt = new Date(test.tested_at);
          return {
            testedAt,
            pass: Boolean(test.pass),
            reason: failureReason(
              Number(test.achieved_percent),
              [Number(test.band_low), Number(test.band_high)],
              testedAt.toISOString().slice(0, 10),
            ),
          };
        }),
      ),
    });
  }
  return map;
}
