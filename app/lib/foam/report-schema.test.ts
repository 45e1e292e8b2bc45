import { describe, expect, it } from "vitest";
import { DispositionLineSchema, FiledReportSchema } from "./report-schema";

describe("runoff lines", () => {
  it("asks for the receiving water of a surface-water release, at its field", () => {
    const missing = DispositionLineSchema.safeParse({ disposition: "surface_water", sharePercent: 100 });
    expect(missing.success).toBe(false);
    expect(missing.error?.issues.map((issue) => issue.path.join("."))).toEqual(["receivingWater"]);
    const named = DispositionLineSchema.safeParse({
      disposition: "surface_water",
      sharePercent: 100,
      receivingWater: "Alder Creek",
    });
    expect(named.success).toBe(true);
  });
});

describe("the first filing attempt", () => {
  it("names the cross-field problems together with the field problems", () => {
    const result = FiledReportSchema.safeParse({
      kind: "incident",
      startedAt: "2026-11-20T14:05",
      clearedAt: "2026-11-20T13:00",
      // No address, no location, no station: field problems.
      discharges: [{ flowUnit: "gpm", basis: "water", productId: 1 }],
      dispositions: [
        { disposition: "storm_drain", sharePercent: 40 },
        { disposition: "contained", sharePercent: 20 },
      ],
    });
    expect(result.success).toBe(false);
    const paths = result.error!.issues.map((issue) => issue.path.join("."));
    // Field problems…
    expect(paths).toEqual(expect.arrayContaining(["address", "latitude", "stationId", "discharges.0.flow"]));
    // …and, in the same answer, the checks across fields of a line and of the report.
    expect(paths).toEqual(
      expect.arrayContaining([
        "discharges.0.percent",
        "discharges.0.minutes",
        "dispositions.1.disposalReference",
        "dispositions",
        "clearedAt",
      ]),
    );
  });

  it("does not add up shares while one of them is not a number", () => {
    const result = FiledReportSchema.safeParse({
      dispositions: [
        { disposition: "storm_drain", sharePercent: 40 },
        { disposition: "soil", sharePercent: "lots" },
      ],
    });
    const messages = result.error!.issues.map((issue) => issue.message);
    expect(messages.some((message) => message.includes("add up to"))).toBe(false);
    expect(result.error!.issues.some((issue) => issue.path.join(".") === "dispositions.1.sharePercent")).toBe(true);
  });
});

describe("a line that is not an object", () => {
  it("is refused at the line, not thrown on, when the JSON API sends null or a number for it", () => {
    const result = FiledReportSchema.safeParse({
      kind: "incident",
      startedAt: "2026-11-20T14:05",
      discharges: [null, 7],
      dispositions: [null],
      tankReadings: [null],
    });
    expect(result.success).toBe(false);
    const paths = result.error?.issues.map((issue) => issue.path.join(".")) ?? [];
    expect(paths).toEqual(expect.arrayContaining(["discharges.0", "discharges.1", "dispositions.0", "tankReadings.0"]));
  });
});
