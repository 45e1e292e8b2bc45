import { describe, expect, it } from "vitest";
import { computeDischarge, foamSystemFor, type FoamSystemFacts } from "./totals";

const system = (overrides: Partial<FoamSystemFacts> = {}): FoamSystemFacts => ({
  id: 7,
  apparatusId: 1,
  name: "Class B around-the-pump",
  active: true,
  percentOf: "solution",
  minConcentrateGpm: 1,
  maxConcentrateGpm: 4,
  waterFlowMinGpm: 50,
  waterFlowMaxGpm: 150,
  outlets: ["Bumper line"],
  outOfTolerance: [],
  ...overrides,
});

const apparatus = new Map([
  [
    1,
    {
      id: 1,
      unitId: "E1",
      proportionerMaxConcentrateGpm: 100,
      proportionerType: "direct_injection" as const,
      waterFlowMinGpm: 0,
      waterFlowMaxGpm: 5000,
    },
  ],
]);

const line = {
  flow: 100,
  flowUnit: "gpm" as const,
  basis: "solution" as const,
  percent: 3,
  minutes: 10,
  apparatusId: 1,
  outlet: "bumper line",
};

describe("a line on a foam system", () => {
  it("is placed on the system serving its outlet, else on the apparatus's only active system", () => {
    const two = new Map([
      [7, system()],
      [8, system({ id: 8, name: "Class A direct injection", outlets: ["Crosslay 1"] })],
    ]);
    expect(foamSystemFor({ apparatusId: 1, outlet: "Crosslay 1" }, two)?.id).toBe(8);
    expect(foamSystemFor({ apparatusId: 1, outlet: "Deck gun" }, two)).toBeNull();
    expect(foamSystemFor({ apparatusId: 1, outlet: "Deck gun" }, new Map([[7, system()]]))?.id).toBe(7);
  });

  it("takes the system's limits and convention, not the apparatus's", () => {
    const systems = new Map([[7, system()]]);
    // 200 gpm of solution at 3 % needs 6 gpm: above the system's 4 gpm (the apparatus allows 100).
    const capped = computeDischarge({ ...line, flow: 200 }, { apparatus, foamSystems: systems });
    expect(capped.foamSystemId).toBe(7);
    expect(capped.percentOf).toBe("solution");
    expect(capped.concentrateGpm).toBe(4);
    expect(capped.warnings.map((warning) => warning.code)).toEqual(
      expect.arrayContaining(["proportioner_limit", "flow_out_of_range"]),
    );
    // 20 gpm at 3 % needs 0.6 gpm: below the system's minimum of 1 gpm.
    const low = computeDischarge({ ...line, flow: 20 }, { apparatus, foamSystems: systems });
    expect(low.warnings.map((warning) => warning.code)).toContain("proportioner_minimum");
  });

  it("carries a warning while the system is out of tolerance, and none after the passing retest", () => {
    const failed = new Date("2026-06-01T12:00:00Z");
    const passed = new Date("2026-06-10T12:00:00Z");
    const systems = new Map([
      [7, system({ outOfTolerance: [{ from: failed, to: passed, reason: "test of 2026-06-01" }] })],
    ]);
    const during = computeDischarge({ ...line, startedAt: new Date("2026-06-05T12:00:00Z") }, { foamSystems: systems });
    expect(during.warnings.map((warning) => warning.code)).toContain("system_out_of_tolerance");
    const after = computeDischarge({ ...line, startedAt: new Date("2026-06-11T12:00:00Z") }, { foamSystems: systems });
    expect(after.warnings.map((warning) => warning.code)).not.toContain("system_out_of_tolerance");
    const before = computeDischarge(line, {
      foamSystems: systems,
      eventWindow: { start: new Date("2026-05-01T12:00:00Z"), end: null },
    });
    expect(before.warnings.map((warning) => warning.code)).not.toContain("system_out_of_tolerance");
  });
});
