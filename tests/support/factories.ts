import { randomUUID } from "node:crypto";
import type { Role } from "~/lib/roles";
import { createUser } from "~/models/user.server";

export const TEST_PASSWORD = "correct horse battery";

/** A new account with the given roles and a unique email. */
export async function makeUser(roles: Role[], name = "Test Person") {
  const email = `${roles.join("-") || "none"}-${randomUUID().slice(0, 8)}@test.example`;
  const id = await createUser({ email, name, password: TEST_PASSWORD, roles }, null);
  return { id, email, name, roles, password: TEST_PASSWORD };
}
