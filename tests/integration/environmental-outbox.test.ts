import { vi, beforeAll, describe, expect, it } from "vitest";

// The outbox exists in demo mode only; the environment is read once, before the app's modules load.
vi.hoisted(() => {
  process.env.DEMO_MODE = "true";
});

import { db } from "~/lib/db.server";
import { queueMail } from "~/models/mail-outbox.server";
import { action as outboxAction, loader as outboxLoader } from "~/routes/admin.outbox";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";

let adminCookie: string;
let adminId: number;
let enviroCookie: string;

beforeAll(async () => {
  const admin = await makeUser(["admin"]);
  adminId = admin.id;
  const enviro = await makeUser(["environmental"]);
  adminCookie = await signIn(admin.email, TEST_PASSWORD, "10.6.0.1");
  enviroCookie = await signIn(enviro.email, TEST_PASSWORD, "10.6.0.2");
});

const statusOf = (value: unknown) =>
  value instanceof Response ? value.status : (value as { init?: { status?: number } }).init?.status;

describe("the demo outbox", () => {
  it("shows administrators the queue with each message's state", async () => {
    const id = await queueMail({
      kind: "returned_report",
      to: ["someone@test.example"],
      subject: "Outbox check",
      text: "Body",
    });
    const page = await outboxLoader(routeArgs(getRequest("/admin/outbox", { Cookie: adminCookie })));
    expect(page.queue.find((row) => row.id === id)).toMatchObject({
      subject: "Outbox check",
      status: "queued",
      attempts: 0,
    });
  });

  it("is refused to other roles", async () => {
    const outcome = await settle(() => outboxLoader(routeArgs(getRequest("/admin/outbox", { Cookie: enviroCookie }))));
    expect(statusOf(outcome.value)).toBe(403);
  });

  it("says so when asked to retry a message that was already sent", async () => {
    const id = await queueMail({
      kind: "returned_report",
      to: ["someone@test.example"],
      subject: "Sent one",
      text: "Body",
    });
    await db("mail_outbox").where({ id }).update({ status: "sent" });
    const outcome = await outboxAction(
      routeArgs(formRequest("/admin/outbox", { intent: "retry", id: String(id) }, { Cookie: adminCookie })),
    );
    expect((outcome as { data: { message: string } }).data.message).toBe("That message is not waiting or failed.");
  });

  it("audits a retry and a discard with who did it and the message's state before", async () => {
    const id = await queueMail({
      kind: "returned_report",
      to: ["audited@test.example"],
      subject: "Audited outbox message",
      text: "Body",
    });
    await db("mail_outbox").where({ id }).update({ status: "failed", attempts: 6 });
    await outboxAction(
      routeArgs(formRequest("/admin/outbox", { intent: "retry", id: String(id) }, { Cookie: adminCookie })),
    );
    await db("mail_outbox").where({ id }).update({ status: "failed" });
    const discarded = await outboxAction(
      routeArgs(formRequest("/admin/outbox", { intent: "discard", id: String(id) }, { Cookie: adminCookie })),
    );
    expect((discarded as { message: string }).message).toMatch(/discarded/);
    expect(await db("mail_outbox").where({ id }).first()).toMatchObject({ status: "discarded" });
    const audits = await db("audit_events")
      .where({ entity_type: "mail_outbox", entity_id: String(id) })
      .orderBy("id");
    expect(audits.map((row) => row.action)).toEqual(["outbox_mail_retried", "outbox_mail_discarded"]);
    expect(audits.every((row) => row.actor_user_id === adminId)).toBe(true);
    expect(JSON.parse(audits[1].before_json)).toMatchObject({ status: "failed", to: "audited@test.example" });
    expect(JSON.parse(audits[1].after_json)).toEqual({ status: "discarded" });

    // A discarded message is neither retried nor sent.
    const again = await outboxAction(
      routeArgs(formRequest("/admin/outbox", { intent: "retry", id: String(id) }, { Cookie: adminCookie })),
    );
    expect((again as { data: { message: string } }).data.message).toBe("That message is not waiting or failed.");
  });
});
