// A database that does not answer becomes the 503 answer in one place: the app's Knex client.
import knexFactory, { type Knex } from "knex";
import { afterAll, describe, expect, it } from "vitest";
import { OutageAwareClient } from "~/lib/db.server";
import { DATABASE_DOWN_MESSAGE } from "~/lib/http.server";

// Port 9 (discard) on loopback: nothing listens, so every connection is refused.
const dead: Knex = knexFactory({
  client: OutageAwareClient as unknown as typeof Knex.Client,
  connection: { host: "127.0.0.1", port: 9, user: "nobody", database: "none", connectTimeout: 500 },
  pool: { min: 0, max: 1 },
  acquireConnectionTimeout: 1_000,
});

afterAll(() => dead.destroy());

const outage = { init: { status: 503 }, data: { message: DATABASE_DOWN_MESSAGE, error: DATABASE_DOWN_MESSAGE } };

describe("a database that does not answer", () => {
  it("turns a query into the 503 pages and APIs show", async () => {
    await expect(dead("events").first()).rejects.toMatchObject(outage);
  });

  it("turns a transaction into the same 503", async () => {
    await expect(dead.transaction(async (trx) => trx("events").first())).rejects.toMatchObject(outage);
  });

  it("leaves other database errors as they are", async () => {
    const { db } = await import("~/lib/db.server");
    await expect(db("no_such_table").first()).rejects.toMatchObject({ code: "ER_NO_SUCH_TABLE" });
  });
});
