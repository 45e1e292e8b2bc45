import { describe, expect, it } from "vitest";
import { conflict, refusalData, refusalStatus, refused } from "./refusal";

describe("refusals", () => {
  it("a conflict is a 409; a refusal keeps its status", () => {
    expect(refusalStatus(conflict("changed"))).toBe(409);
    expect(refusalStatus(refused(403, "no"))).toBe(403);
  });

  it("answers with the form's reply, the message on top and errors at their fields", () => {
    const seen: unknown[] = [];
    const submission = { reply: (options: unknown) => (seen.push(options), { status: "error" }) };
    const answer = refusalData(submission, refused(400, "Fix it", { number: ["Taken"] }), { conflict: null });
    expect(answer.init?.status).toBe(400);
    expect(answer.data).toEqual({ result: { status: "error" }, conflict: null });
    expect(seen).toEqual([{ formErrors: ["Fix it"], fieldErrors: { number: ["Taken"] } }]);
  });
});
