import { randomUUID } from "node:crypto";
import type { Role } from "~/lib/access";
import { createUser } from "~/models/user.server";

export const TEST_PASSWORD = "correct horse battery";

/** A new account with the given roles (and own station) and a unique email. */
export async function makeUser(roles: Role[], name = "Test Person", options: { stationId?: number | null } = {}) {
  const email = `${roles.join("-") || "none"}-${randomUUID().slice(0, 8)}@test.example`;
  const id = await createUser({ email, name, password: TEST_PASSWORD, roles, stationId: options.stationId }, null);
  return { id, email, name, roles, password: TEST_PASSWORD };
}
