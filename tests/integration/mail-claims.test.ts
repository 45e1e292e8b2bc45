import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { deliverPendingMail, queueMail } from "~/models/mail-outbox.server";
import { startFakeSmtp, type FakeSmtp } from "../../scripts/fake-smtp";

let smtp: FakeSmtp;
let directory: string;
let smtpUrl: string;

beforeAll(async () => {
  directory = await mkdtemp(path.join(tmpdir(), "foamtally-claims-"));
  smtp = await startFakeSmtp({ port: 0, directory });
  smtpUrl = `smtp://127.0.0.1:${smtp.port}`;
});

afterAll(async () => {
  await smtp?.close();
  await rm(directory, { recursive: true, force: true });
});

async function queue(tag: string, count: number): Promise<number[]> {
  const ids: number[] = [];
  for (let i = 0; i < count; i++) {
    const id = await queueMail({
      kind: "returned_report",
      to: ["crew@test.example"],
      subject: `${tag} ${i}`,
      text: "x",
    });
    ids.push(id!);
  }
  return ids;
}

describe("claiming queued mail", () => {
  it("sends each message once when several senders run at the same moment", async () => {
    const tag = `Claim race ${Date.now()}`;
    const ids = await queue(tag, 24);
    await Promise.all([1, 2, 3, 4].map(() => deliverPendingMail({ smtpUrl, limit: 10 })));
    // Whatever the racing senders left (mail queued by other tests shares the queue) goes now.
    await Promise.all([1, 2].map(() => deliverPendingMail({ smtpUrl })));
    const received = (await smtp.messages()).filter((message) => message.subject.startsWith(tag));
    expect(received).toHaveLength(24);
    expect(new Set(received.map((message) => message.subject)).size).toBe(24);
    const rows = await db("mail_outbox").whereIn("id", ids).select("status", "attempts");
    expect(rows.every((row) => row.status === "sent" && row.attempts === 1)).toBe(true);
  });

  it("skips a message another server holds locked instead of waiting for it", async () => {
    const tag = `Claim skip ${Date.now()}`;
    const [held, ...free] = await queue(tag, 3);
    const trx = await db.transaction();
    try {
      await trx("mail_outbox").where({ id: held }).forUpdate().first();
      // Without SKIP LOCKED this would wait for the lock (50 s by default) and the test would time out.
      await deliverPendingMail({ smtpUrl });
      expect((await db("mail_outbox").where({ id: held }).first()).status).toBe("queued");
      expect(await db("mail_outbox").whereIn("id", free).pluck("status")).toEqual(["sent", "sent"]);
    } finally {
      await trx.rollback();
    }
    await deliverPendingMail({ smtpUrl });
    expect((await db("mail_outbox").where({ id: held }).first()).status).toBe("sent");
  });
});
