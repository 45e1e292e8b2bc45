import { describe, expect, it } from "vitest";
import { parseWithZod } from "@conform-to/zod/v4";
import {
  AgencySettingsSchema,
  feetFromMetres,
  isIsoDate,
  isKnownTimeZone,
  splitRecipientList,
} from "./agency-settings-form";

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
  recordsDueRule: "federal",
  recordsOfficeCloses: "17:00",
  recordsClosureDays: "",
  recordsWithholdingRule: "the exemptions of the State Public Records Act",
};

/** The field messages the page would show, as conform gives them from posted text. */
function fieldErrors(fields: Record<string, string>): Record<string, string[]> {
  const form = new FormData();
  for (const [key, value] of Object.entries({ ...valid, ...fields })) form.append(key, String(value));
  const submission = parseWithZod(form, { schema: AgencySettingsSchema });
  if (submission.status === "success") return {};
  return (submission.reply().error ?? {}) as Record<string, string[]>;
}

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

  it("takes the public-records settings and sorts the closure days, one a line", () => {
    const parsed = AgencySettingsSchema.parse({
      ...valid,
      recordsDueRule: "illinois",
      recordsOfficeCloses: " 16:30 ",
      recordsClosureDays: "2026-12-24\n2026-12-07\n\n2026-12-24",
    });
    expect(parsed.recordsDueRule).toBe("illinois");
    expect(parsed.recordsOfficeCloses).toBe("16:30");
    expect(parsed.recordsClosureDays).toEqual(["2026-12-07", "2026-12-24"]);
    expect(AgencySettingsSchema.parse(valid).recordsClosureDays).toEqual([]);
  });

  it("knows a real calendar date from a made-up one", () => {
    expect(isIsoDate("2028-02-29")).toBe(true);
    expect(isIsoDate("2026-02-29")).toBe(false);
    expect(isIsoDate("2026-13-01")).toBe(false);
    expect(isIsoDate("12/24/2026")).toBe(false);
  });

  it("puts a bad closing time, a bad closure day and an unknown rule at their fields", () => {
    expect(fieldErrors({ recordsOfficeCloses: "5pm" }).recordsOfficeCloses).toEqual([
      "Give the closing time as HH:MM on a 24-hour clock, e.g. 17:00.",
    ]);
    expect(fieldErrors({ recordsOfficeCloses: "24:00" }).recordsOfficeCloses).toHaveLength(1);
    expect(fieldErrors({ recordsClosureDays: "2026-12-24\n2026-02-30\n12/31/2026" }).recordsClosureDays).toEqual([
      "“2026-02-30” is not a date written YYYY-MM-DD.",
      "“12/31/2026” is not a date written YYYY-MM-DD.",
    ]);
    expect(fieldErrors({ recordsDueRule: "atlantis" }).recordsDueRule).toEqual(["Choose one of the rules listed."]);
    expect(fieldErrors({ recordsWithholdingRule: "" }).recordsWithholdingRule).toEqual([
      "Name the law whose exemptions the cover letter cites.",
    ]);
    expect(fieldErrors({})).toEqual({});
  });
});
