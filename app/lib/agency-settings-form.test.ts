import { describe, expect, it } from "vitest";
import { AgencySettingsSchema, feetFromMetres, isKnownTimeZone, splitRecipientList } from "./agency-settings-form";

const valid = {
  version: "abc",
  name: "Test District (test)",
  timeZone: "America/Chicago",
  displayUnits: "us",
  waterwayBufferM: 91.44,
  drawdownTolerancePercent: 15,
  pfasReportableLb: 1,
  classAAccuracyPercent: 30,
  reportRecipients: "a@test.example",
  releaseAlertRecipients: "",
};

describe("agency settings form", () => {
  it("300 ft is exactly 91.44 m (definition of the international foot, 0.3048 m)", () => {
    expect(feetFromMetres(91.44)).toBeCloseTo(300, 10);
  });

  it("splits recipient lists on commas, semicolons and new lines", () => {
    expect(splitRecipientList(" a@x.example,b@x.example;\nc@x.example  ")).toEqual([
      "a@x.example",
      "b@x.example",
      "c@x.example",
    ]);
    expect(splitRecipientList("")).toEqual([]);
  });

  it("knows IANA zones from the runtime's list and refuses made-up ones", () => {
    expect(isKnownTimeZone("America/Chicago")).toBe(true);
    expect(isKnownTimeZone("UTC")).toBe(true);
    expect(isKnownTimeZone("Mars/Olympus_Mons")).toBe(false);
  });

  it("takes the incident number prefix in capitals and refuses a fixed series or odd characters", () => {
    expect(AgencySettingsSchema.parse({ ...valid, eventNumberPrefix: " nv2 " }).eventNumberPrefix).toBe("NV2");
    expect(AgencySettingsSchema.parse(valid).eventNumberPrefix).toBeUndefined();
    for (const prefix of ["TR", "PT", "FL", "2A", "A-B", "ABCDEFG", ""]) {
      expect(AgencySettingsSchema.safeParse({ ...valid, eventNumberPrefix: prefix }).success).toBe(false);
    }
  });

  it("accepts a complete form and an empty release list", () => {
    const parsed = AgencySettingsSchema.parse(valid);
    expect(parsed.reportRecipients).toEqual(["a@test.example"]);
    expect(parsed.releaseAlertRecipients).toEqual([]);
  });

  it("refuses more decimals than are stored, and names each bad address", () => {
    const result = AgencySettingsSchema.safeParse({
      ...valid,
      waterwayBufferM: 91.445,
      reportRecipients: "a@test.example, nope, also-nope@",
    });
    expect(result.success).toBe(false);
    const messages = result.error!.issues.map((issue) => `${issue.path.join(".")}: ${issue.message}`);
    expect(messages).toEqual([
      "waterwayBufferM: At most two decimals (centimetres).",
      "reportRecipients: “nope” is not an e-mail address.",
      "reportRecipients: “also-nope@” is not an e-mail address.",
    ]);
  });
});
