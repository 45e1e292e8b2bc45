// Two people editing one foam system: the edit form carries the version it was opened with, and a
// save from a stale copy is refused with the typing kept and nothing written.
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import {
  action as systemEditAction,
  loader as systemEditLoader,
} from "~/routes/apparatus.$apparatusId.foam-systems.$systemId";
import { makeApparatusRow, makeProductRow } from "../support/catalogue-factories";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency } from "../support/usage-fixtures";

const statusOf = (value: unknown) =>
  value instanceof Response ? value.status : ((value as { init?: { status?: number } }).init?.status ?? 200);
type Reply = { error?: Record<string, string[] | null>; initialValue?: Record<string, unknown> };
const replyOf = (value: unknown) => (value as { data: { result: Reply } }).data.result;

describe("saving a foam system from its edit page", () => {
  let cookie: string;
  let apparatusId: number;
  let productId: number;

  beforeAll(async () => {
    await ensureAgency();
    const chief = await makeUser(["chief"], "Chief Versions");
    cookie = await signIn(chief.email, TEST_PASSWORD);
    productId = (await makeProductRow({ foamClass: "B" })).id;
  });

  const save = (systemId: number | "new", fields: Record<string, string>) =>
    settle(() =>
      systemEditAction(
        routeArgs(
          formRequest(
            `/apparatus/${apparatusId}/foam-systems/${systemId}`,
            { systemType: "around_the_pump", percentOf: "solution", active: "on", ...fields },
            { Cookie: cookie },
          ),
          { apparatusId: String(apparatusId), systemId: String(systemId) },
        ),
      ),
    );
  const systemRow = (id: number) => db("foam_systems").where({ id }).first();
  const tankRows = (id: number) => db("foam_system_tanks").where({ foam_system_id: id }).orderBy("id");
  const outletNames = (id: number) =>
    db("foam_system_outlets").where({ foam_system_id: id }).orderBy("outlet_name").pluck("outlet_name");
  const auditCount = async (id: number) =>
    Number(
      (
        await db("audit_events")
          .where({ entity_type: "foam_system", entity_id: String(id) })
          .count({ n: "*" })
      )[0].n,
    );

  /** A system on an apparatus of its own, created through the form (version 1). */
  async function newSystem(name: string) {
    apparatusId = (await makeApparatusRow({ outlets: [{ name: "Bumper line" }, { name: "Crosslay 1" }] })).id;
    const created = await save("new", {
      name,
      maxConcentrateGpm: "6",
      tankName: "Tank B",
      tankCapacityGal: "20",
      tankProductId: String(productId),
      outlets: "Bumper line",
    });
    expect(statusOf(created.value)).toBe(302);
    const row = await db("foam_systems").where({ apparatus_id: apparatusId, name }).first();
    expect(row.version).toBe(1);
    return row.id as number;
  }

  it("hands the edit form the system's version", async () => {
    const systemId = await newSystem("Class B versions page");
    await db("foam_systems").where({ id: systemId }).update({ version: 3 });
    const page = (await systemEditLoader(
      routeArgs(getRequest(`/apparatus/${apparatusId}/foam-systems/${systemId}`, { Cookie: cookie }), {
        apparatusId: String(apparatusId),
        systemId: String(systemId),
      }),
    )) as { system: { version: number } };
    expect(page.system.version).toBe(3);
  });

  it("saves a change from a fresh copy and raises the version", async () => {
    const systemId = await newSystem("Class B fresh save");
    const saved = await save(systemId, {
      name: "Class B fresh save",
      maxConcentrateGpm: "7.5",
      tankName: "Tank B",
      tankCapacityGal: "25",
      tankProductId: String(productId),
      outlets: "Bumper line, Crosslay 1",
      version: "1",
    });
    expect(statusOf(saved.value)).toBe(302);
    const row = await systemRow(systemId);
    expect(row.version).toBe(2);
    expect(Number(row.max_concentrate_gpm)).toBe(7.5);
    expect(Number((await tankRows(systemId))[0].capacity_gal)).toBe(25);
    expect(await outletNames(systemId)).toEqual(["Bumper line", "Crosslay 1"]);
  });

  it("refuses a save from a stale copy with 409, keeps the typing and writes nothing", async () => {
    const systemId = await newSystem("Class B stale save");
    // Both people opened the form at version 1; the first save wins.
    const first = await save(systemId, {
      name: "Class B stale save",
      maxConcentrateGpm: "6.5",
      tankName: "Tank B",
      tankCapacityGal: "20",
      tankProductId: String(productId),
      outlets: "Bumper line",
      version: "1",
    });
    expect(statusOf(first.value)).toBe(302);
    const system = await systemRow(systemId);
    const tanks = await tankRows(systemId);
    const outlets = await outletNames(systemId);
    const audits = await auditCount(systemId);

    const stale = await save(systemId, {
      name: "Second person's name (test)",
      maxConcentrateGpm: "9",
      tankName: "Tank C",
      tankCapacityGal: "40",
      outlets: "Crosslay 1",
      version: "1",
    });
    expect(stale.thrown).toBe(false);
    expect(statusOf(stale.value)).toBe(409);
    const reply = replyOf(stale.value);
    expect(reply.error?.[""]?.[0]).toMatch(
      /This foam system changed after you opened it \(someone saved it, or recorded an accuracy test on it\)/,
    );
    expect(reply.initialValue).toMatchObject({
      name: "Second person's name (test)",
      maxConcentrateGpm: "9",
      tankName: "Tank C",
      version: "1",
    });

    expect(await systemRow(systemId)).toEqual(system);
    expect(system.version).toBe(2);
    expect(Number(system.max_concentrate_gpm)).toBe(6.5);
    expect(await tankRows(systemId)).toEqual(tanks);
    expect(await outletNames(systemId)).toEqual(outlets);
    expect(await auditCount(systemId)).toBe(audits);

    // A form without its version is refused the same way.
    const missing = await save(systemId, { name: "Class B stale save", maxConcentrateGpm: "8" });
    expect(statusOf(missing.value)).toBe(409);
    expect(await systemRow(systemId)).toEqual(system);

    // The copy reloaded at version 2 saves.
    const reloaded = await save(systemId, {
      name: "Class B stale save",
      maxConcentrateGpm: "9",
      tankName: "Tank B",
      tankCapacityGal: "20",
      tankProductId: String(productId),
      outlets: "Bumper line",
      version: "2",
    });
    expect(statusOf(reloaded.value)).toBe(302);
    expect(Number((await systemRow(systemId)).max_concentrate_gpm)).toBe(9);
  });
});
