import { describe, expect, it } from "vitest";
import { computeUsage } from "~/lib/foam/totals";
import {
  dischargeInputs,
  dischargeRows,
  dispositionRows,
  statedResults,
  tankReadingRows,
  totalsColumns,
  type ReportDischarge,
} from "./report-rows.server";

const lines: ReportDischarge[] = [
  { apparatusId: 3, productId: 7, percent: 0.5, flow: 100, minutes: 10, outlet: "Crosslay 1" },
  // A water-only line keeps no percent even when one was typed.
  { apparatusId: 3, productId: null, percent: 3, flow: 50, flowUnit: "lpm", basis: "solution", minutes: 4 },
];

describe("a report's rows", () => {
  it("stores each discharge with the computation's volumes, in order", () => {
    const computed = computeUsage(dischargeInputs(lines));
    const rows = dischargeRows(41, lines, computed);
    expect(rows.map((row) => row.position)).toEqual([1, 2]);
    expect(rows[0]).toMatchObject({ event_id: 41, outlet: "Crosslay 1", percent: 0.5, flow_unit: "gpm" });
    expect(rows[0].water_gal).toBeCloseTo(1000, 9);
    expect(rows[0].concentrate_gal).toBeCloseTo(5, 9);
    expect(rows[1]).toMatchObject({ percent: null, flow_unit: "lpm", flow_basis: "solution", concentrate_gal: 0 });
  });

  it("puts the totals, the PFAS flag and every warning on the event", () => {
    const computed = statedResults(
      [
        { water: 990, concentrate: 10 },
        { water: 200, concentrate: 0 },
      ],
      true,
    );
    computed.discharges[1].warnings.push({ code: "flow_out_of_range", message: "Flow outside the pump's range." });
    expect(totalsColumns(computed)).toEqual({
      water_gal: 1190,
      concentrate_gal: 10,
      solution_gal: 1200,
      pfas_containing: true,
      has_warnings: true,
      event_warnings: "[]",
    });
  });

  it("tells a refill from a pair of tank levels by the figures given", () => {
    const rows = tankReadingRows(5, [
      { apparatusId: 1, productId: 2, refillGal: 12 },
      { apparatusId: 1, productId: 2, levelBeforeGal: 30, levelAfterGal: 21 },
    ]);
    expect(rows.map((row) => row.kind)).toEqual(["refill", "levels"]);
  });

  it("keeps a runoff line's share or volume and leaves the rest empty", () => {
    expect(dispositionRows(5, [{ disposition: "storm_drain", sharePercent: 40 }])).toEqual([
      {
        event_id: 5,
        disposition: "storm_drain",
        share_percent: 40,
        volume_gal: null,
        receiving_water: "",
        disposal_reference: "",
        sewer_notice: "",
        notes: null,
      },
    ]);
  });
});
