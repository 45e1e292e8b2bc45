import { parseWithZod } from "@conform-to/zod/v4";
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { FiledReportSchema, REPORT_FORM_SCHEMAS, TotalsRequestSchema } from "./foam/report-schema";
import { boundedDraft, readStoredDraft } from "./foam/report-draft.server";
import {
  BodyRefused,
  formShape,
  pruneToShape,
  readBodyBytes,
  readBoundedForm,
  readFormData,
  readJsonBody,
} from "./form-data.server";
import { SignInFormSchema } from "./sign-in-form";

const URL_BASE = "http://127.0.0.1:3000/x";
const reportShape = formShape(REPORT_FORM_SCHEMAS);

function urlencoded(body: string, headers: Record<string, string> = {}) {
  return new Request(URL_BASE, {
    method: "POST",
    body,
    headers: { "Content-Type": "application/x-www-form-urlencoded", ...headers },
  });
}

async function refusal(run: () => Promise<unknown>): Promise<{ status: number; message: string }> {
  try {
    await run();
  } catch (error) {
    if (error instanceof BodyRefused) return { status: error.status, message: error.message };
    const thrown = error as { init?: { status?: number }; data?: { message?: string } };
    if (error instanceof Response) return { status: error.status, message: (await error.json()).error };
    return { status: thrown.init?.status ?? 0, message: thrown.data?.message ?? String(error) };
  }
  throw new Error("the body was not refused");
}

describe("reading a form with the bounds of its schema", () => {
  it("keeps the schema's keys and drops the rest, so a huge index under an unknown name costs nothing", async () => {
    const form = await readFormData(
      urlencoded("email=bad&password=x&x%5B100000000%5D=1&x[1000000]=1"),
      SignInFormSchema,
    );
    expect([...form.keys()]).toEqual(["email", "password"]);
    const reply = JSON.stringify(parseWithZod(form, { schema: SignInFormSchema }).reply());
    expect(reply.length).toBeLessThan(1_000);
  });

  it("refuses an index past the schema's own maximum with a short 400", async () => {
    const refused = await refusal(() =>
      readBoundedForm(urlencoded("number=A-1&discharges%5B1000000000%5D.flow=1"), reportShape),
    );
    expect(refused).toEqual({ status: 400, message: "The form has more than 200 entries for discharges." });
    expect((await refusal(() => readBoundedForm(urlencoded("discharges[200].flow=1"), reportShape))).status).toBe(400);
    expect(
      (await refusal(() => readBoundedForm(urlencoded("dispositions[12].disposition=soil"), reportShape))).status,
    ).toBe(400);
    expect(
      (await refusal(() => readBoundedForm(urlencoded("discharges[99999999999999999999].flow=1"), reportShape))).status,
    ).toBe(400);
  });

  it("keeps a full report of 200 discharges, 12 runoff lines and 20 tank readings", async () => {
    const body = new URLSearchParams({ intent: "file", submissionKey: "key-12345678", number: "A-1" });
    for (let index = 0; index < 200; index++) {
      body.append(`discharges[${index}].flow`, "100");
      body.append(`discharges[${index}].minutes`, "5");
    }
    for (let index = 0; index < 12; index++) body.append(`dispositions[${index}].disposition`, "soil");
    for (let index = 0; index < 20; index++) body.append(`tankReadings[${index}].refillGal`, "1");
    const form = await readBoundedForm(urlencoded(body.toString()), reportShape);
    expect([...form.keys()]).toHaveLength(3 + 400 + 12 + 20);
    const payload = parseWithZod(form, { schema: FiledReportSchema }).payload as { discharges: unknown[] };
    expect(payload.discharges).toHaveLength(200);
  });

  it("drops names conform cannot parse instead of failing on them", async () => {
    const form = await readBoundedForm(
      urlencoded("number=A-1&a..b=1&discharges[].flow=1&discharges[0]..flow=2&__proto__[x]=1&constructor=1&]=1"),
      reportShape,
    );
    expect([...form.entries()]).toEqual([["number", "A-1"]]);
  });

  it("refuses a field far longer than its schema allows, and too many fields", async () => {
    const long = await refusal(() => readBoundedForm(urlencoded(`number=${"A".repeat(5_000)}`), reportShape));
    expect(long.status).toBe(400);
    expect(long.message).toContain("number");
    const shape = formShape(SignInFormSchema);
    const many = await refusal(() => readBoundedForm(urlencoded("y=1&".repeat(200)), shape));
    expect(many).toEqual({ status: 400, message: "The form has more than 104 fields." });
    const repeated = await refusal(() => readBoundedForm(urlencoded("email=a&email=b"), shape));
    expect(repeated.status).toBe(400);
  });

  it("takes a list of plain values as one name repeated, up to the list's maximum", async () => {
    const shape = formShape(z.object({ roles: z.array(z.string()).max(3) }));
    const form = await readBoundedForm(urlencoded("roles=a&roles=b&roles=c"), shape);
    expect(form.getAll("roles")).toEqual(["a", "b", "c"]);
    expect((await refusal(() => readBoundedForm(urlencoded("roles=a&roles=b&roles=c&roles=d"), shape))).status).toBe(
      400,
    );
  });

  it("answers 415 for a body that is not a form: JSON, text or none", async () => {
    const shape = formShape(SignInFormSchema);
    const json = new Request(URL_BASE, { method: "POST", body: "{}", headers: { "Content-Type": "application/json" } });
    const text = new Request(URL_BASE, { method: "POST", body: "email=a", headers: { "Content-Type": "text/plain" } });
    const none = new Request(URL_BASE, { method: "POST" });
    for (const request of [json, text, none])
      expect((await refusal(() => readBoundedForm(request, shape))).status).toBe(415);
  });

  it("answers 400 for a broken multipart body and keeps files only where the schema takes one", async () => {
    const shape = formShape(z.object({ name: z.string(), sheet: z.file().optional() }));
    const broken = new Request(URL_BASE, {
      method: "POST",
      body: '--x\r\nContent-Disposition: form-data; name="name"\r\n\r\nunfinished',
      headers: { "Content-Type": "multipart/form-data; boundary=x" },
    });
    expect(await refusal(() => readBoundedForm(broken, shape))).toEqual({
      status: 400,
      message: "The form's multipart body could not be read. Send the form again.",
    });
    const body = new FormData();
    body.append("name", new File(["not text"], "a.txt"));
    body.append("sheet", new File(["%PDF-"], "a.pdf", { type: "application/pdf" }));
    const form = await readBoundedForm(new Request(URL_BASE, { method: "POST", body }), shape);
    expect(form.get("name")).toBeNull();
    expect(form.get("sheet")).toBeInstanceOf(File);
  });
});

describe("the byte limit", () => {
  it("refuses a declared length past the limit without reading the body", async () => {
    let pulled = 0;
    const body = new ReadableStream({
      pull(controller) {
        pulled++;
        controller.enqueue(new Uint8Array(1024));
      },
    });
    const request = new Request(URL_BASE, {
      method: "POST",
      body,
      duplex: "half",
      headers: { "Content-Length": String(100 * 1024 * 1024) },
    } as RequestInit);
    expect((await refusal(() => readBodyBytes(request, 1024 * 1024))).status).toBe(413);
    expect(pulled).toBeLessThanOrEqual(1);
  });

  it("counts the bytes of a body without a declared length and stops at the limit", async () => {
    let sent = 0;
    const body = new ReadableStream({
      pull(controller) {
        sent += 64 * 1024;
        controller.enqueue(new Uint8Array(64 * 1024));
      },
    });
    const request = new Request(URL_BASE, { method: "POST", body, duplex: "half" } as RequestInit);
    const refused = await refusal(() => readBodyBytes(request, 1024 * 1024));
    expect(refused).toEqual({ status: 413, message: "The request is larger than 1 MB and was not read." });
    expect(sent).toBeLessThan(2 * 1024 * 1024);
  });
});

describe("the JSON reader", () => {
  const jsonRequest = (body: string, type = "application/json") =>
    new Request(URL_BASE, { method: "POST", body, headers: { "Content-Type": type } });

  it("drops unknown keys and refuses a list past its maximum", async () => {
    const body = await readJsonBody(
      jsonRequest(JSON.stringify({ discharges: [{ flow: 1, extra: "x".repeat(10) }], other: [1, 2, 3] })),
      TotalsRequestSchema,
    );
    expect(body).toEqual({ discharges: [{ flow: 1 }] });
    const many = JSON.stringify({ discharges: Array.from({ length: 100_000 }, () => ({})) });
    expect(await refusal(() => readJsonBody(jsonRequest(many), TotalsRequestSchema))).toEqual({
      status: 400,
      message: "discharges has more than 200 entries.",
    });
  });

  it("answers 415 for a form, 400 for broken JSON and 413 past the limit", async () => {
    expect(
      (await refusal(() => readJsonBody(jsonRequest("a=1", "application/x-www-form-urlencoded"), TotalsRequestSchema)))
        .status,
    ).toBe(415);
    expect((await refusal(() => readJsonBody(jsonRequest("{"), TotalsRequestSchema))).status).toBe(400);
    expect((await refusal(() => readJsonBody(jsonRequest("[".repeat(100_000)), TotalsRequestSchema))).status).toBe(400);
    const large = jsonRequest(JSON.stringify({ text: "x".repeat(2 * 1024 * 1024) }));
    expect((await refusal(() => readJsonBody(large, TotalsRequestSchema))).status).toBe(413);
  });
});

describe("stored drafts", () => {
  it("are cut to the report form's shape, so an old overweight draft opens as at most 200 lines", () => {
    const stored = JSON.stringify({ number: "D-1", discharges: Array.from({ length: 1001 }, () => null), junk: 1 });
    const draft = readStoredDraft(stored) as { discharges: unknown[] };
    expect(draft.discharges).toHaveLength(200);
    expect(draft).not.toHaveProperty("junk");
    expect(readStoredDraft("{not json")).toBeNull();
    expect(readStoredDraft("{}", 10 * 1024 * 1024)).toBeNull();
  });

  it("keep every value a valid form may hold", () => {
    const payload = {
      number: "D-2",
      narrative: "Typed, not yet valid: 12 gallons?",
      discharges: [{ flow: "abc", minutes: "5", outlet: "Crosslay 1" }, null, { flow: "100" }],
      dispositions: [{ disposition: "soil", sharePercent: "100" }],
      intent: "save-draft",
    };
    expect(boundedDraft(payload)).toEqual(payload);
    expect(pruneToShape("text", reportShape)).toBeUndefined();
  });
});
