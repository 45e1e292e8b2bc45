// Every route of app/routes.ts, requested as nobody, as each role, and with each role's API token,
// on records of one's own and of others: each answer must be what the access table says.
import { beforeAll, describe, expect, it } from "vitest";
import {
  type AccessDecision,
  changeCapabilityFor,
  decide,
  type Principal,
  type ReportRecord,
  type ReportStatus,
  ROLES,
  type Role,
  ROUTE_ACCESS,
  type RouteRequirement,
  acceptsApiToken,
} from "~/lib/access";
import type { SessionUser } from "~/lib/auth.server";
import { db } from "~/lib/db.server";
import { createApiToken } from "~/models/api-token.server";
import routes from "~/routes";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency, makeApparatus, makeEvent, makeProduct, makeStation } from "../support/usage-fixtures";

type RouteEntry = { path?: string; file: string; index?: boolean };
type RouteModule = { loader?: (args: never) => Promise<unknown>; action?: (args: never) => Promise<unknown> };

const ROUTES = (routes as RouteEntry[]).map((entry) => ({ key: entry.path ?? "", file: entry.file }));

async function moduleOf(file: string): Promise<RouteModule> {
  return (await import(/* @vite-ignore */ `../../app/${file}`)) as RouteModule;
}

type Caller = { name: string; principal: Principal | null; headers: HeadersInit; token: boolean };

const callers: Caller[] = [];
let officerStation: number;
let otherStation: number;
const reports: Array<{ label: string; id: number; record: ReportRecord }> = [];
let accountTargets: Array<{ label: string; id: number; roles: Role[] }> = [];
const fixed: Record<string, string> = {};

beforeAll(async () => {
  await ensureAgency();
  officerStation = (await makeStation()).id;
  otherStation = (await makeStation()).id;
  const otherOfficer = await makeUser(["officer"], "Other Officer", { stationId: otherStation });
  for (const role of ROLES) {
    const stationId = role === "officer" ? officerStation : null;
    const user = await makeUser([role], `Matrix ${role}`, { stationId });
    const principal: Principal = { id: user.id, roles: [role], stationId };
    const cookie = await signIn(user.email, TEST_PASSWORD);
    callers.push({ name: role, principal, headers: { Cookie: cookie }, token: false });
    const sessionUser = { ...principal, roles: [role], email: user.email, name: user.name, epoch: 0 } as SessionUser;
    const { token } = await createApiToken(sessionUser, "matrix");
    callers.push({ name: `${role} token`, principal, headers: { Authorization: `Bearer ${token}` }, token: true });
  }
  callers.push({ name: "nobody", principal: null, headers: {}, token: false });

  const officer = callers.find((caller) => caller.name === "officer")!.principal!;
  const author = { own: officer.id, other: otherOfficer.id };
  const station = { own: officerStation, other: otherStation };
  const shapes: Array<[ReportStatus, keyof typeof author, keyof typeof station]> = [
    ["draft", "own", "own"],
    ["draft", "other", "own"],
    ["filed", "own", "other"],
    ["filed", "other", "own"],
    ["returned", "own", "other"],
    ["returned", "other", "own"],
    ["returned", "other", "other"],
    ["accepted", "own", "other"],
    ["accepted", "other", "own"],
    ["accepted", "other", "other"],
  ];
  for (const [status, by, at] of shapes) {
    const created = await makeEvent({
      createdBy: author[by],
      status,
      stationId: station[at],
      startedAt: new Date("2026-02-01T12:00:00Z"),
    });
    // Every report has an earlier state, so the revision page answers where the report may be read.
    await db("event_revisions").insert({
      event_id: created.id,
      revision: 0,
      reason: "Matrix revision",
      snapshot_json: JSON.stringify({
        event: await db("events").where({ id: created.id }).first(),
        discharges: [],
        dispositions: [],
        tankReadings: [],
      }),
      created_by: otherOfficer.id,
    });
    reports.push({
      label: `${status} by ${by} officer at ${at} station`,
      id: created.id,
      record: { status, createdBy: author[by], stationId: station[at] },
    });
  }

  const admin = await makeUser(["admin"], "Target Administrator");
  const clerk = await makeUser(["records"], "Target Clerk");
  accountTargets = [
    { label: "an administrator", id: admin.id, roles: ["admin"] },
    { label: "a records clerk", id: clerk.id, roles: ["records"] },
  ];

  fixed.productId = String((await makeProduct({ foamClass: "A" })).id);
  fixed.apparatusId = String((await makeApparatus(officerStation)).id);
  fixed.stationId = String(officerStation);
  const [submission] = await db("quarterly_submissions").insert({
    period_from: "2026-01-01",
    period_to: "2026-03-31",
    label: "2026 Q1",
    file_name: "matrix.xlsx",
    content_type: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
    content: Buffer.from("matrix"),
    sha256: "0".repeat(64),
    byte_size: 6,
    submitted_by: otherOfficer.id,
  });
  fixed.submissionId = String(submission);
});

/** The URL and params each route is requested with, and the record its rule looks at. */
function targetsOf(
  key: string,
): Array<{ label: string; url: string; params: Record<string, string>; record?: ReportRecord }> {
  if (
    key === "events/:id" ||
    key === "events/:id/edit" ||
    key === "api/events/:id" ||
    key === "events/:id/revisions/:revision" ||
    key === "events/:id/report.pdf"
  ) {
    return reports.map((report) => ({
      label: report.label,
      url: `/${key.replace(":id", String(report.id)).replace(":revision", "0")}`,
      params: { id: String(report.id), revision: "0" },
      record: report.record,
    }));
  }
  const params: Record<string, Record<string, string>> = {
    "tiles/:z/:x/:file": { z: "0", x: "0", file: "0.pbf" },
    "api/geo/layers/:kind": { kind: "drainage_basins" },
    "products/:productId": { productId: fixed.productId },
    "products/:productId/safety-sheet": { productId: fixed.productId },
    "apparatus/:apparatusId": { apparatusId: fixed.apparatusId },
    "stations/:stationId": { stationId: fixed.stationId },
    "environmental/submissions/:id": { id: fixed.submissionId },
    "records-requests/:trackingCode": { trackingCode: "RR-22222-22222" },
    "records/:id": { id: "999999" },
    "records/:id/files/:fileId": { id: "999999", fileId: "999999" },
    "api/records-requests/:id": { id: "999999" },
    "*": { "*": "no-such-page" },
  };
  const routeParams = params[key] ?? {};
  let url = `/${key}`;
  for (const [name, value] of Object.entries(routeParams)) url = url.replace(name === "*" ? "*" : `:${name}`, value);
  const query: Record<string, string> = {
    "reports/environmental.xlsx": "?year=2026&quarter=1",
    "reports/environmental.csv": "?year=2026&quarter=1",
    "api/geo/check": "?lat=38.7&lon=-98.2",
    "api/geo/addresses": "?q=elm",
  };
  return [{ label: "", url: url + (query[key] ?? ""), params: routeParams }];
}

/** A form body that exercises the guard without changing anything the other cells rely on. */
function bodyOf(key: string): Record<string, string> {
  if (key === "admin/outbox") return { intent: "retry", id: "0" };
  return {};
}

function statusOf(value: unknown): number {
  if (value instanceof Response) return value.status;
  const init = (value as { init?: { status?: number } | null } | null)?.init;
  return init?.status ?? 200;
}

function expected(caller: Caller, requirement: RouteRequirement, url: string, record?: ReportRecord): AccessDecision {
  if (requirement === "public") return "allow";
  const principal = caller.token && !acceptsApiToken(new URL(url, "http://x").pathname) ? null : caller.principal;
  if (requirement === "signed-in") return decide(principal, "signed-in");
  return decide(principal, requirement, record as never);
}

function observed(value: unknown, api: boolean): AccessDecision | "other" {
  const status = statusOf(value);
  if (value instanceof Response && status === 302) {
    return (value.headers.get("Location") ?? "").startsWith("/sign-in") ? "sign-in" : "other";
  }
  if (api && status === 401) return "sign-in";
  if (status === 403) return "forbidden";
  if (status === 404) return "hidden";
  return "other";
}

describe("the access table covers every route", () => {
  it("has an entry for each route in app/routes.ts, with a requirement for exactly its loader and action", async () => {
    for (const { key, file } of ROUTES) {
      const access = ROUTE_ACCESS[key];
      expect(access, `routes.ts lists "${key}" but the access table has no entry for it`).toBeDefined();
      const module = await moduleOf(file);
      expect(Boolean(access.GET), `"${key}" GET`).toBe(Boolean(module.loader));
      expect(Boolean(access.POST), `"${key}" POST`).toBe(Boolean(module.action));
    }
    expect(Object.keys(ROUTE_ACCESS).sort()).toEqual(ROUTES.map((route) => route.key).sort());
  });
});

describe("every route × principal × record", () => {
  it("answers each caller as the access table says", { timeout: 300_000 }, async () => {
    const mismatches: string[] = [];
    let cells = 0;
    for (const { key, file } of ROUTES) {
      const module = await moduleOf(file);
      for (const method of ["GET", "POST"] as const) {
        const requirement = ROUTE_ACCESS[key][method];
        const handler = method === "GET" ? module.loader : module.action;
        if (!requirement || !handler) continue;
        for (const target of targetsOf(key)) {
          // The edit page changes a report: editing it, or revising it once it is accepted.
          const needed =
            (key === "events/:id/edit" || (key === "api/events/:id" && method === "POST")) && target.record
              ? changeCapabilityFor(target.record.status)
              : requirement;
          for (const caller of callers) {
            if (key === "sign-out" && caller.principal && method === "POST") continue;
            const request =
              method === "GET"
                ? getRequest(target.url, caller.headers)
                : formRequest(target.url, bodyOf(key), caller.headers);
            const outcome = await settle(() => handler(routeArgs(request, target.params) as never));
            if (outcome.thrown && !(outcome.value instanceof Response) && !("init" in Object(outcome.value))) {
              mismatches.push(`${method} ${target.url} as ${caller.name}: threw ${String(outcome.value)}`);
              continue;
            }
            cells++;
            const want = expected(caller, needed, target.url, target.record);
            const got = observed(outcome.value, acceptsApiToken(new URL(target.url, "http://x").pathname));
            const status = statusOf(outcome.value);
            const ok =
              requirement === "public"
                ? true
                : want === "allow"
                  ? got === "other" || (got === "hidden" && !target.record && key !== "events/:id")
                  : got === want;
            if (!ok || status >= 500) {
              mismatches.push(
                `${method} ${target.url}${target.label ? ` (${target.label})` : ""} as ${caller.name}: expected ${want}, got ${got} (${status})`,
              );
            }
          }
        }
      }
    }
    expect(mismatches).toEqual([]);
    expect(cells).toBeGreaterThan(500);
  });

  it("lets the chief manage people but not administrators; an administrator manages both", async () => {
    const { action } = await moduleOf("routes/admin.users.tsx");
    for (const name of ["chief", "admin"]) {
      const caller = callers.find((candidate) => candidate.name === name)!;
      for (const target of accountTargets) {
        const body = {
          intent: "update",
          userId: String(target.id),
          name: `Target ${target.label}`,
          roles: target.roles,
          active: "on",
        };
        const outcome = await settle(() =>
          action!(routeArgs(formRequest("/admin/users", body, caller.headers)) as never),
        );
        const want = decide(caller.principal, "users.manage", { roles: target.roles });
        expect(statusOf(outcome.value), `${name} saving ${target.label}`).toBe(want === "allow" ? 302 : 403);
      }
    }
  });
});
