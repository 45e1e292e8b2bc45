import { describe, expect, it } from "vitest";
import { decideAccess, hasRole, isRole } from "./roles";

describe("decideAccess", () => {
  it("sends someone who is not signed in to sign in, whatever the page", () => {
    expect(decideAccess(null, [])).toBe("sign-in");
    expect(decideAccess(null, ["admin"])).toBe("sign-in");
  });

  it("lets any signed-in person use an open page, even with no roles", () => {
    expect(decideAccess([], [])).toBe("allow");
  });

  it("allows when one held role is among the allowed ones", () => {
    expect(decideAccess(["officer", "chief"], ["chief", "admin"])).toBe("allow");
  });

  it("forbids when no held role is allowed", () => {
    expect(decideAccess(["officer"], ["admin"])).toBe("forbidden");
    expect(decideAccess([], ["officer"])).toBe("forbidden");
  });
});

describe("role names", () => {
  it("recognises only the five roles", () => {
    expect(["officer", "environmental", "chief", "records", "admin"].every(isRole)).toBe(true);
    expect(isRole("superuser")).toBe(false);
    expect(isRole(undefined)).toBe(false);
  });

  it("hasRole is true for any one of the wanted roles", () => {
    expect(hasRole(["records"], "admin", "records")).toBe(true);
    expect(hasRole(["records"], "admin")).toBe(false);
  });
});
