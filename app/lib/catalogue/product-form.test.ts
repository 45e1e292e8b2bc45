import { parseWithZod } from "@conform-to/zod/v4";
import { describe, expect, it } from "vitest";
import { ApparatusFormSchema } from "./apparatus-form";
import { parseNominalPercents, ProductFormSchema } from "./product-form";

function form(fields: Record<string, string>) {
  const data = new FormData();
  for (const [key, value] of Object.entries(fields)) data.append(key, value);
  return data;
}

describe("nominal percentages", () => {
  it("reads a comma list, with or without % signs, sorted and without repeats", () => {
    expect(parseNominalPercents("6, 3")).toEqual([3, 6]);
    expect(parseNominalPercents("0.1; 0.3 0.5, 1%")).toEqual([0.1, 0.3, 0.5, 1]);
    expect(parseNominalPercents("3, 3")).toEqual([3]);
    expect(parseNominalPercents("")).toEqual([]);
  });

  it("refuses anything that is not a percentage above 0 and below 100", () => {
    for (const bad of ["3, x", "0", "-1", "100", "3,,abc", "Infinity"]) expect(parseNominalPercents(bad)).toBeNull();
  });
});

describe("the product form", () => {
  it("turns a complete form into typed values", () => {
    const submission = parseWithZod(
      form({
        name: "  Demo AR-AFFF  ",
        foamClass: "B",
        foamType: "ar-afff",
        nominalPercents: "3, 6",
        pfasContaining: "on",
        pfasContent: "1.5",
        pfasContentUnit: "percent_w_w",
        pfasContentSource: "safety sheet",
        unitCostPerGal: "40",
      }),
      { schema: ProductFormSchema },
    );
    expect(submission.status).toBe("success");
    if (submission.status !== "success") return;
    expect(submission.value).toMatchObject({
      name: "Demo AR-AFFF",
      nominalPercents: [3, 6],
      pfasContaining: true,
      pfasContent: 1.5,
      unitCostPerGal: 40,
      active: false,
      maker: null,
    });
  });

  it("refuses a share by weight above 100 %", () => {
    const submission = parseWithZod(
      form({
        name: "x",
        foamClass: "B",
        foamType: "afff",
        nominalPercents: "3",
        pfasContaining: "on",
        pfasContent: "150",
        pfasContentUnit: "percent_w_w",
        pfasContentSource: "lab",
      }),
      { schema: ProductFormSchema },
    );
    expect(submission.reply().error?.pfasContent?.[0]).toMatch(/at most 100/);
  });
});

describe("the apparatus form", () => {
  it("reads outlets as a list with their defaults", () => {
    const submission = parseWithZod(
      form({
        unitId: "E9",
        compressedAirCfm: "200",
        "outlets[0].name": "Crosslay 1",
        "outlets[0].foamCapable": "on",
        "outlets[0].defaultFlowGpm": "100",
        "outlets[0].defaultMethod": "compressed_air",
      }),
      { schema: ApparatusFormSchema },
    );
    expect(submission.status).toBe("success");
    if (submission.status !== "success") return;
    expect(submission.value.outlets).toEqual([
      {
        name: "Crosslay 1",
        foamCapable: true,
        defaultFlowGpm: 100,
        defaultFlowBasis: "water",
        defaultMethod: "compressed_air",
      },
    ]);
    expect(submission.value.stationId).toBeUndefined();
  });

  it("refuses an unknown method and a flow of zero at the outlet's field", () => {
    const submission = parseWithZod(
      form({
        unitId: "E9",
        "outlets[0].name": "A",
        "outlets[0].defaultMethod": "foam-cannon",
        "outlets[0].defaultFlowGpm": "0",
      }),
      { schema: ApparatusFormSchema },
    );
    const error = submission.reply().error ?? {};
    expect(error["outlets[0].defaultMethod"]?.[0]).toMatch(/Choose a method/);
    expect(error["outlets[0].defaultFlowGpm"]?.[0]).toMatch(/above zero/);
  });
});
