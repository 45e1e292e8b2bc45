import { describe, expect, it } from "vitest";
import { computeUsage, type ProductFacts } from "./totals";

// Issue 10 §4: PFAS-containing foam chosen for training, a test or a flush gets a warning that several
// states ban it (Colorado C.R.S. 24-33.5-1234; California Health & Safety Code §13062).
const legacy: ProductFacts = { id: 1, name: "Legacy AFFF", foamClass: "B", nominalPercents: [3], pfasContaining: true };
const fluorineFree: ProductFacts = { id: 2, name: "F3", foamClass: "B", nominalPercents: [3], pfasContaining: false };
const products = new Map([
  [1, legacy],
  [2, fluorineFree],
]);
const line = (productId: number) => ({
  flow: 100,
  flowUnit: "gpm" as const,
  basis: "water" as const,
  percent: 3,
  minutes: 5,
  productId,
});
const codes = (eventKind: "incident" | "training" | "test" | "flush", productId: number) =>
  computeUsage([line(productId)], { products, eventKind }).eventWarnings.map((warning) => warning.code);

describe("PFAS-containing foam outside an incident", () => {
  it("is warned about for training, a test and a flush, citing Colorado and California", () => {
    for (const kind of ["training", "test", "flush"] as const)
      expect(codes(kind, 1)).toContain("pfas_non_incident_use");
    const warning = computeUsage([line(1)], { products, eventKind: "training" }).eventWarnings.find(
      (item) => item.code === "pfas_non_incident_use",
    );
    expect(warning?.message).toContain("C.R.S. 24-33.5-1234");
    expect(warning?.message).toContain("§13062");
  });

  it("is not warned about at an incident, or for fluorine-free foam", () => {
    expect(codes("incident", 1)).not.toContain("pfas_non_incident_use");
    expect(codes("training", 2)).not.toContain("pfas_non_incident_use");
  });
});
