import { it, expect } from "vitest";
import { db } from "~/lib/db.server";
import { saveStation } from "~/models/apparatus.server";
import { currentDataVersions } from "~/models/data-version.server";
import { makeStation } from "../support/usage-fixtures";
it("dbg", async () => {
  const { id } = await makeStation();
  const st = await db("stations").where({ id }).first();
  const before = await currentDataVersions(db);
  await saveStation(id, Number(st.version), { code: `${st.code}R`, name: st.name, address: "", latitude: null, longitude: null, active: true }, { id: 1, email: "x", name: "x", roles: ["admin"], stationId: null } as never);
  const after = await currentDataVersions(db);
  console.log(st.code, (await db("stations").where({ id }).first()).code, before, after);
});
