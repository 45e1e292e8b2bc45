import type { Knex } from "knex";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { appAccountKnex, testKnex } from "../support/test-database";

// The app connects as an account that reads and writes rows only; the schema belongs to the
// migration account (scripts/db.sh grants both, knexfile.ts uses the second).
let app: Knex;
let owner: Knex;
let auditId: number;

beforeAll(async () => {
  app = appAccountKnex();
  owner = testKnex();
  [auditId] = await app("audit_events").insert({ action: "privilege_probe", entity_type: "test" });
});

afterAll(async () => {
  await app.destroy();
  await owner.destroy();
});

describe("the app's database account", () => {
  it("is the account the app's own connection uses", async () => {
    const [[appUser]] = await db.raw("SELECT CURRENT_USER() AS user");
    const [[probeUser]] = await app.raw("SELECT CURRENT_USER() AS user");
    expect(appUser.user).toBe(probeUser.user);
    const [[ownerUser]] = await owner.raw("SELECT CURRENT_USER() AS user");
    expect(ownerUser.user).not.toBe(appUser.user);
  });

  it("reads and writes rows", async () => {
    const [id] = await app("stations").insert({ code: "PRIV-1", name: "Privilege probe station" });
    await app("stations").where({ id }).update({ name: "Privilege probe station (renamed)" });
    expect((await app("stations").where({ id }).first()).name).toBe("Privilege probe station (renamed)");
    await app("stations").where({ id }).delete();
    expect(await app("stations").where({ id }).first()).toBeUndefined();
  });

  it("cannot drop or truncate a table", async () => {
    await expect(app.raw("DROP TABLE discharges")).rejects.toThrow(/DROP command denied/);
    await expect(app.raw("TRUNCATE TABLE audit_events")).rejects.toThrow(/DROP command denied/);
    await expect(app.raw("TRUNCATE TABLE events")).rejects.toThrow(/DROP command denied/);
    expect(await owner.schema.hasTable("discharges")).toBe(true);
  });

  it("cannot alter the schema, make tables or grant privileges", async () => {
    await expect(app.raw("ALTER TABLE events ADD COLUMN probe INT")).rejects.toThrow(/ALTER command denied/);
    await expect(app.raw("CREATE TABLE probe (id INT)")).rejects.toThrow(/CREATE command denied/);
    await expect(app.raw("DROP TRIGGER audit_events_no_update")).rejects.toThrow(/denied/);
    await expect(app.raw("GRANT SELECT ON events TO CURRENT_USER")).rejects.toThrow(/denied/);
    expect(await owner.schema.hasColumn("events", "probe")).toBe(false);
  });

  it("cannot change or delete an audit row", async () => {
    await expect(app("audit_events").where({ id: auditId }).update({ action: "changed" })).rejects.toThrow(
      /append-only/,
    );
    await expect(app("audit_events").where({ id: auditId }).delete()).rejects.toThrow(/append-only/);
    expect((await owner("audit_events").where({ id: auditId }).first()).action).toBe("privilege_probe");
  });
});
