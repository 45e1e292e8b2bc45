import bcrypt from "bcryptjs";
import type { Knex } from "knex";

// Demo data only: the invented Alder Bend Fire District and invented people.
export const DEMO_PASSWORD = "alder-bend-demo-2026";

export const DEMO_ACCOUNTS = [
  { email: "officer@alderbend.example", name: "Lt. Rowan Keats (demo)", roles: ["officer"], station: "S1" },
  { email: "enviro@alderbend.example", name: "Imani Okafor (demo)", roles: ["environmental"] },
  { email: "chief@alderbend.example", name: "Chief Dana Whitlow (demo)", roles: ["chief"] },
  { email: "records@alderbend.example", name: "Priya Santos (demo)", roles: ["records"] },
  { email: "admin@alderbend.example", name: "Morgan Lee (demo)", roles: ["admin"] },
  { email: "officer2@alderbend.example", name: "Capt. Sam Ortiz (demo)", roles: ["officer"], station: "S2" },
] as const;

export async function seed(knex: Knex): Promise<void> {
  await knex("agency_settings")
    .insert({
      id: 1,
      name: "Alder Bend Fire District (demo)",
      time_zone: "America/Chicago",
      report_recipients: "state-runoff-desk@alderbend.example",
      release_alert_recipients: "enviro@alderbend.example",
    })
    .onConflict("id")
    .ignore();

  // Cost 12 like real accounts; hashed once and shared, since every demo account has the same password.
  const passwordHash = await bcrypt.hash(DEMO_PASSWORD, 12);
  for (const account of DEMO_ACCOUNTS) {
    const existing = await knex("users").where({ email: account.email }).first();
    if (existing) continue;
    const [id] = await knex("users").insert({ email: account.email, name: account.name, password_hash: passwordHash });
    await knex("user_roles").insert(account.roles.map((role) => ({ user_id: id, role })));
    await knex("audit_events").insert({
      actor_label: "demo seed",
      action: "user_created",
      entity_type: "user",
      entity_id: String(id),
      after_json: JSON.stringify({ email: account.email, roles: account.roles }),
    });
  }
}
