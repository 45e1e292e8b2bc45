import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import {
  acceptsApiToken,
  CAPABILITIES,
  CAPABILITY_NAMES,
  can,
  changeCapabilityFor,
  decide,
  isRole,
  type Principal,
  type ReportRecord,
  rolesCan,
  withAccessTable,
} from "./access";

const officer: Principal = { id: 1, roles: ["officer"], stationId: 10 };
const report = (overrides: Partial<ReportRecord>): ReportRecord => ({
  status: "filed",
  createdBy: 2,
  stationId: 20,
  ...overrides,
});

describe("the access table", () => {
  it("names only the five roles, and every capability has at least one", () => {
    expect(["officer", "environmental", "chief", "records", "admin"].every(isRole)).toBe(true);
    expect(isRole("superuser")).toBe(false);
    for (const capability of CAPABILITY_NAMES) expect(CAPABILITIES[capability].grants.length).toBeGreaterThan(0);
  });

  it("README.md's role table is the one generated from it (npm run access:table)", () => {
    const readme = readFileSync(new URL("../../README.md", import.meta.url), "utf8");
    expect(withAccessTable(readme)).toBe(readme);
  });

  it("keeps reports from the administrator unless a reading role is also held", () => {
    expect(rolesCan(["admin"], "report.read")).toBe(false);
    expect(rolesCan(["admin", "records"], "report.read")).toBe(true);
  });
});

describe("an officer and the reports of others", () => {
  it("opens and edits their own drafts only", () => {
    expect(can(officer, "report.edit", report({ status: "draft", createdBy: 1 }))).toBe(true);
    expect(decide(officer, "report.edit", report({ status: "draft", createdBy: 2, stationId: 10 }))).toBe("hidden");
  });

  it("fixes returned reports of their own station, or their own, and no others", () => {
    expect(can(officer, "report.edit", report({ status: "returned", stationId: 10 }))).toBe(true);
    expect(can(officer, "report.edit", report({ status: "returned", createdBy: 1 }))).toBe(true);
    expect(decide(officer, "report.edit", report({ status: "returned", stationId: 20 }))).toBe("forbidden");
  });

  it("revises accepted reports of their own station only", () => {
    expect(changeCapabilityFor("accepted")).toBe("report.revise");
    expect(can(officer, "report.revise", report({ status: "accepted", stationId: 10 }))).toBe(true);
    expect(can(officer, "report.revise", report({ status: "accepted", stationId: 20, createdBy: 1 }))).toBe(false);
  });

  it("with no station, has no station's reports", () => {
    const unplaced: Principal = { ...officer, stationId: null };
    expect(can(unplaced, "report.edit", report({ status: "returned", stationId: null }))).toBe(false);
    expect(can(unplaced, "report.revise", report({ status: "accepted", stationId: null }))).toBe(false);
  });

  it("does not change someone else's filed report; a reviewer may", () => {
    expect(can(officer, "report.edit", report({ status: "filed", stationId: 10 }))).toBe(false);
    expect(can({ id: 5, roles: ["environmental"], stationId: null }, "report.edit", report({}))).toBe(true);
  });
});

describe("people and roles", () => {
  const chief: Principal = { id: 3, roles: ["chief"], stationId: null };
  it("the chief manages people who are not administrators, and grants no administrator role", () => {
    expect(can(chief, "users.manage", { roles: ["officer"] })).toBe(true);
    expect(can(chief, "users.manage", { roles: ["admin"] })).toBe(false);
    expect(can(chief, "users.grant-admin")).toBe(false);
    expect(can({ id: 4, roles: ["admin"], stationId: null }, "users.grant-admin")).toBe(true);
  });
});

describe("decisions", () => {
  it("sends someone not signed in to sign in, whatever the capability", () => {
    expect(decide(null, "signed-in")).toBe("sign-in");
    expect(decide(null, "users.manage")).toBe("sign-in");
  });

  it("lets any signed-in person in where only that is asked, even with no roles", () => {
    expect(decide({ id: 9, roles: [], stationId: null }, "signed-in")).toBe("allow");
    expect(decide({ id: 9, roles: [], stationId: null }, "report.read")).toBe("forbidden");
  });

  it("takes API tokens on /api/* only", () => {
    expect(acceptsApiToken("/api/me")).toBe(true);
    expect(acceptsApiToken("/admin/users")).toBe(false);
    expect(acceptsApiToken("/apiary")).toBe(false);
    expect(acceptsApiToken("/events.csv")).toBe(false);
  });
});
