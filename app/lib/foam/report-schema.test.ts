import { describe, expect, it } from "vitest";
import { DispositionLineSchema } from "./report-schema";

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
