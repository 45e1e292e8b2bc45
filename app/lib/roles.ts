export const ROLES = ["officer", "environmental", "chief", "records", "admin"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  officer: "Company officer",
  environmental: "Environmental officer",
  chief: "Chief",
  records: "Records clerk",
  admin: "Administrator",
};

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}

export type RoleDecision = "allow" | "sign-in" | "forbidden";

/** Whether a person holding `held` may use something open to `allowed` (empty: any signed-in user). */
export function decideAccess(held: readonly Role[] | null, allowed: readonly Role[]): RoleDecision {
  if (held === null) return "sign-in";
  if (allowed.length === 0) return "allow";
  return held.some((role) => allowed.includes(role)) ? "allow" : "forbidden";
}

export function hasRole(held: readonly Role[], ...wanted: Role[]): boolean {
  return wanted.some((role) => held.includes(role));
}
