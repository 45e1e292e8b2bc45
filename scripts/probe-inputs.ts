// Bad-input probe: sends generated malformed bodies (fast-check) to every form action and JSON
// endpoint of a running Foamtally with the demo accounts, and checks that none is answered with a
// 5xx and that no refused request leaves a row behind. Not a load test: requests go one at a time.
//   tsx scripts/probe-inputs.ts [--count 500] [--base http://127.0.0.1:3000] [--seed 7]
// It reads row counts from the database the server uses (DB_* variables, as in .env). Inputs are
// built so that none can succeed in changing settings, people or layers; drafts and API tokens of
// the probing accounts may be saved, as any officer's would be.
import { existsSync } from "node:fs";
import fc from "fast-check";
import knexFactory, { type Knex } from "knex";
import type { Role } from "../app/lib/access";

export type ProbeSummary = {
  endpoint: string;
  sent: number;
  statuses: Record<string, number>;
  serverErrors: { status: number; input: string }[];
  partialRows: { status: number; input: string; changed: string[] }[];
};

type Body = { label: string; contentType?: string; body?: string | FormData | Uint8Array<ArrayBuffer> };
type Endpoint = {
  path: string;
  role: ProbeRole | null;
  /** Field names the form knows; the generator mixes them with junk. */
  fields: string[];
  /** Sent first, so that no generated input can succeed where success would change shared data. */
  poison?: [string, string][];
  json?: boolean;
  file?: string;
  /** A report form: half the inputs carry a valid intent, so that the save itself sees the junk. */
  report?: boolean;
};

const DEMO_PASSWORD = "alder-bend-demo-2026";
/** The demo accounts the probe signs in as (the roles its endpoints need). */
const ACCOUNTS = {
  officer: "officer2@alderbend.example",
  environmental: "enviro@alderbend.example",
  chief: "chief@alderbend.example",
  admin: "admin@alderbend.example",
} satisfies Partial<Record<Role, string>>;
type ProbeRole = keyof typeof ACCOUNTS;

/** Rows a refused request must never add, remove or leave half-written. */
const WATCHED_TABLES = [
  "events",
  "discharges",
  "runoff_dispositions",
  "tank_readings",
  "event_revisions",
  "form_submissions",
  "stations",
  "apparatus",
  "apparatus_outlets",
  "foam_products",
  "users",
  "user_roles",
  "api_tokens",
  "geo_layers",
  "quarterly_submissions",
];

const LINE_FIELDS = {
  discharges: ["apparatusId", "outlet", "productId", "percent", "flow", "flowUnit", "basis", "minutes", "startedAt"],
  dispositions: ["disposition", "sharePercent", "volumeGal", "disposalReference", "sewerNotice"],
  tankReadings: ["apparatusId", "productId", "refillGal", "levelBeforeGal", "levelAfterGal"],
  outlets: ["name", "foamCapable", "defaultFlowGpm", "defaultFlowBasis", "defaultMethod"],
} as const;

const REPORT_FIELDS = [
  "intent",
  "submissionKey",
  "eventId",
  "version",
  "revisionReason",
  "number",
  "kind",
  "startedAt",
  "clearedAt",
  "address",
  "latitude",
  "longitude",
  "stationId",
  "narrative",
];

function endpoints(draftId: number, filedId: number): Endpoint[] {
  return [
    { path: "/sign-in", role: null, fields: ["email", "password", "redirectTo"] },
    { path: "/events/new", role: "officer", fields: REPORT_FIELDS, report: true },
    { path: `/events/${draftId}/edit`, role: "officer", fields: REPORT_FIELDS, report: true },
    {
      path: `/events/${filedId}`,
      role: "environmental",
      fields: ["decision", "version", "comment"],
      poison: [["version", "999999999"]],
    },
    {
      path: "/stations/new",
      role: "chief",
      fields: ["code", "name", "address", "latitude", "longitude", "active", "version"],
      poison: [["code", "not a code!"]],
    },
    {
      path: "/apparatus/new",
      role: "chief",
      fields: ["unitId", "description", "stationId", "concentrateTankGal", "waterFlowMaxGpm", "active", "outlets"],
      poison: [["unitId", "U".repeat(40)]],
    },
    {
      path: "/products/new",
      role: "environmental",
      fields: ["name", "maker", "foamClass", "foamType", "nominalPercents", "pfasContaining", "pfasContent"],
      poison: [["foamType", "not-a-type"]],
      file: "safetySheet",
    },
    {
      path: "/admin/settings",
      role: "admin",
      fields: ["version", "name", "timeZone", "displayUnits", "waterwayBufferM", "drawdownTolerancePercent"],
      poison: [["version", "probe-never-current"]],
    },
    {
      path: "/admin/users",
      role: "admin",
      fields: ["intent", "userId", "name", "email", "password", "roles", "active"],
      // A new account's email already exists; an update names no account.
      poison: [
        ["email", ACCOUNTS.admin],
        ["userId", "999999999"],
      ],
    },
    {
      path: "/profile",
      role: "officer",
      fields: ["intent", "name", "tokenId", "currentPassword", "newPassword", "confirmPassword"],
    },
    {
      path: "/environmental",
      role: "environmental",
      fields: ["intent", "note", "year", "quarter", "from", "to"],
      poison: [
        ["year", "probe"],
        ["from", "probe"],
      ],
    },
    {
      path: "/geography",
      role: "environmental",
      fields: ["kind"],
      file: "file",
    },
    { path: "/api/totals", role: "officer", fields: ["discharges"], json: true },
  ];
}

const awkwardText = fc.constantFrom(
  "",
  " ",
  "0",
  "-1",
  "+5",
  "0x10",
  "1e309",
  "-0",
  "NaN",
  "Infinity",
  "2147483648",
  "4294967296",
  "9007199254740993",
  "1.5e-400",
  "abc",
  "null",
  "true",
  "on",
  "file",
  "save-draft",
  "create",
  "update",
  "accept",
  "return",
  "2026-02-30T25:61",
  "9999-12-31T23:59",
  "<script>alert(1)</script>",
  '=HYPERLINK("http://x")',
  "\u0000",
  "\uFFFF",
  "\u3000",
  "%",
  "../../etc/passwd",
  "a".repeat(5_000),
  "9".repeat(400),
  "x".repeat(25_000),
  '{"type":"update","payload":{"name":"discharges[1000000]","value":"1"}}',
  '{"type":"insert","payload":{"name":"discharges","index":1000000000}}',
  '{"type":"reorder","payload":{"name":"discharges","from":0,"to":99999}}',
);
const text = fc.oneof(awkwardText, fc.string({ maxLength: 40 }), fc.double().map(String), fc.integer().map(String));
const index = fc.oneof(
  fc.nat(5).map(String),
  fc.constantFrom("199", "200", "201", "1000", "5000", "1000000000", "99999999999999999999", "00", "-1", "1e3", ""),
);

function fieldName(endpoint: Endpoint) {
  const lists = Object.entries(LINE_FIELDS);
  return fc.oneof(
    { weight: 4, arbitrary: fc.constantFrom(...endpoint.fields) },
    {
      weight: 3,
      arbitrary: fc
        .tuple(fc.constantFrom(...lists), index)
        .chain(([[list, subfields], at]) => fc.constantFrom(...subfields).map((sub) => `${list}[${at}].${sub}`)),
    },
    {
      weight: 1,
      arbitrary: fc.constantFrom(
        "__proto__",
        "constructor",
        "__proto__[polluted]",
        "x[100000000]",
        "a..b",
        "[]",
        "a[",
        "a]",
        "discharges[]",
        "discharges",
        "__INTENT__",
        "roles[0]",
      ),
    },
    { weight: 1, arbitrary: fc.string({ maxLength: 20 }) },
  );
}

function bodies(endpoint: Endpoint): fc.Arbitrary<Body> {
  const poison = endpoint.poison ?? [];
  const intent = endpoint.report
    ? fc.option(
        fc.tuple(fc.constantFrom("save-draft", "file"), fc.uuid()).map(([value, key]): [string, string][] => [
          ["intent", value],
          ["submissionKey", key],
        ]),
      )
    : fc.constant(null);
  const entries = fc
    .tuple(intent, fc.array(fc.tuple(fieldName(endpoint), text), { maxLength: 30 }))
    .map(([valid, list]) => [...poison, ...(valid ?? []), ...list]);
  const urlencoded = entries.map((list): Body => ({
    label: "urlencoded",
    contentType: "application/x-www-form-urlencoded",
    body: new URLSearchParams(list).toString(),
  }));
  const multipart = fc.tuple(entries, fc.uint8Array({ maxLength: 2_000 })).map(([list, bytes]): Body => {
    const form = new FormData();
    for (const [name, value] of list) form.append(name, value);
    if (endpoint.file) form.append(endpoint.file, new File([bytes], "probe.bin", { type: "application/pdf" }));
    return { label: "multipart", body: form };
  });
  const json = fc.jsonValue({ maxDepth: 4 }).map((value): Body => {
    const shaped = endpoint.json && value && typeof value === "object" ? value : { discharges: value };
    return { label: "json", contentType: "application/json", body: JSON.stringify(endpoint.json ? shaped : value) };
  });
  const deepJson = fc
    .nat({ max: 50_000 })
    .map((depth): Body => ({ label: "deep json", contentType: "application/json", body: "[".repeat(depth) }));
  const longList = fc.constantFrom(201, 5_000, 60_000).map((length): Body => ({
    label: `json list of ${length}`,
    contentType: "application/json",
    body: JSON.stringify({ discharges: Array.from({ length }, () => ({ flow: 1 })) }),
  }));
  const discharge = fc.record(
    {
      flow: fc.oneof(fc.double(), fc.integer(), text, fc.constant(null)),
      flowUnit: fc.oneof(fc.constantFrom("gpm", "lpm", "L/min"), text),
      basis: fc.oneof(fc.constantFrom("water", "solution"), text),
      percent: fc.oneof(fc.double(), text, fc.constant(null)),
      minutes: fc.oneof(fc.double(), fc.integer(), text),
      productId: fc.oneof(fc.integer(), fc.constantFrom(1, 2, 3, 0, -1, 2147483648, 1e300), text, fc.constant(null)),
      apparatusId: fc.oneof(fc.integer(), fc.constantFrom(1, 2, 0, 2147483648), text, fc.constant(null)),
    },
    { requiredKeys: [] },
  );
  const totals = fc.array(discharge, { maxLength: 12 }).map((discharges): Body => ({
    label: "totals json",
    contentType: "application/json",
    body: JSON.stringify({ discharges }),
  }));
  const plain = fc
    .string({ maxLength: 200 })
    .map((value): Body => ({ label: "text", contentType: "text/plain", body: value }));
  const none = fc.constant<Body>({ label: "no body" });
  const brokenMultipart = fc.string({ maxLength: 80 }).map((value): Body => ({
    label: "broken multipart",
    contentType: "multipart/form-data; boundary=probe",
    body: `--probe\r\nContent-Disposition: form-data; name="${value}"\r\n\r\n${value}`,
  }));
  const badEncoding = fc.constantFrom(
    "a=%zz&b=%E0%A4%A",
    "%",
    "=&=&&==",
    "email=%C0%AE%C0%AE",
    "x[0][0][0][0][0][0][0][0][0][0][0][0]=1",
  );
  const brokenUrlencoded = badEncoding.map((body): Body => ({
    label: "bad urlencoding",
    contentType: "application/x-www-form-urlencoded",
    body,
  }));
  const oversized = fc.constant<Body>({
    label: "2 MB form",
    contentType: "application/x-www-form-urlencoded",
    body: `a=${"x".repeat(2 * 1024 * 1024)}`,
  });
  const binary = fc.uint8Array({ maxLength: 500 }).map((bytes): Body => ({
    label: "binary",
    contentType: "application/x-www-form-urlencoded",
    body: new Uint8Array(bytes),
  }));
  return fc.oneof(
    { weight: 10, arbitrary: urlencoded },
    { weight: 4, arbitrary: multipart },
    { weight: endpoint.json ? 10 : 2, arbitrary: json },
    { weight: 1, arbitrary: deepJson },
    { weight: endpoint.json ? 2 : 0, arbitrary: longList },
    { weight: endpoint.json ? 10 : 0, arbitrary: totals },
    { weight: 1, arbitrary: plain },
    { weight: 1, arbitrary: none },
    { weight: 1, arbitrary: brokenMultipart },
    { weight: 1, arbitrary: brokenUrlencoded },
    { weight: 1, arbitrary: binary },
    { weight: 1, arbitrary: oversized },
  );
}

async function rowCounts(knex: Knex): Promise<Record<string, number>> {
  const counts: Record<string, number> = {};
  for (const table of WATCHED_TABLES) {
    const [{ count }] = await knex(table).count({ count: "*" });
    counts[table] = Number(count);
  }
  return counts;
}

/** Events whose report was filed but whose lines are missing: a half-written report. */
async function halfWrittenReports(knex: Knex): Promise<number> {
  const [{ count }] = await knex("events")
    .whereIn("status", ["filed", "accepted", "returned"])
    .andWhere((where) =>
      where
        .whereNotExists(knex("discharges").whereRaw("discharges.event_id = events.id"))
        .orWhereNotExists(knex("runoff_dispositions").whereRaw("runoff_dispositions.event_id = events.id")),
    )
    .count({ count: "*" });
  return Number(count);
}

async function signIn(base: string, email: string): Promise<string> {
  const response = await fetch(`${base}/sign-in`, {
    method: "POST",
    body: new URLSearchParams({ email, password: DEMO_PASSWORD }),
    redirect: "manual",
  });
  const cookie = response.headers.get("Set-Cookie");
  if (response.status !== 302 || !cookie) throw new Error(`could not sign in as ${email} (${response.status})`);
  return cookie.split(";")[0];
}

function describeInput(probe: Body): string {
  const body =
    typeof probe.body === "string"
      ? probe.body.slice(0, 300)
      : probe.body instanceof FormData
        ? [...probe.body.keys()].join("&").slice(0, 300)
        : probe.body
          ? `${probe.body.byteLength} bytes`
          : "";
  return `${probe.label}: ${body}`;
}

export async function probeInputs(options: {
  base: string;
  count: number;
  seed?: number;
  /** The database the server uses, when it is not DB_NAME's. */
  database?: string;
  log?: (line: string) => void;
}): Promise<ProbeSummary[]> {
  if (existsSync(".env")) process.loadEnvFile(".env");
  const { default: config } = await import("../knexfile");
  const connection = config.connection as Knex.ConnectionConfig;
  const knex = knexFactory({
    ...config,
    connection: { ...connection, database: options.database ?? connection.database },
  });
  const log = options.log ?? (() => {});
  try {
    const cookies = new Map<ProbeRole | null, string>();
    for (const role of Object.keys(ACCOUNTS) as ProbeRole[]) {
      cookies.set(role, await signIn(options.base, ACCOUNTS[role]));
    }
    const draft = await fetch(`${options.base}/events/new`, {
      method: "POST",
      headers: { Cookie: cookies.get("officer")! },
      body: new URLSearchParams({
        intent: "save-draft",
        submissionKey: crypto.randomUUID(),
        number: `PROBE-${Date.now()}`,
      }),
      redirect: "manual",
    });
    const draftId = Number(draft.headers.get("Location")?.match(/\/events\/(\d+)\/edit/)?.[1]);
    if (!draftId) throw new Error(`could not save the probe's draft (${draft.status})`);
    const filed = await knex("events").where({ status: "filed" }).first("id");
    if (!filed) throw new Error("the database has no filed report to review: seed the demo data first");

    const summaries: ProbeSummary[] = [];
    for (const [position, endpoint] of endpoints(draftId, filed.id).entries()) {
      const summary: ProbeSummary = {
        endpoint: endpoint.path,
        sent: 0,
        statuses: {},
        serverErrors: [],
        partialRows: [],
      };
      const inputs = fc.sample(bodies(endpoint), { numRuns: options.count, seed: (options.seed ?? 7) + position });
      for (const probe of inputs) {
        const before = await rowCounts(knex);
        const headers: Record<string, string> = {};
        if (probe.contentType) headers["Content-Type"] = probe.contentType;
        const cookie = cookies.get(endpoint.role);
        if (cookie) headers.Cookie = cookie;
        const response = await fetch(`${options.base}${endpoint.path}`, {
          method: "POST",
          headers,
          body: probe.body,
          redirect: "manual",
        }).catch(() => null);
        if (!response) {
          // The server may close a connection it refused before the whole body was sent; it must
          // still be answering.
          const alive = await fetch(`${options.base}/sign-in`).then(
            (answer) => answer.ok,
            () => false,
          );
          if (!alive) throw new Error(`the server stopped answering after ${describeInput(probe)}`);
          summary.sent++;
          summary.statuses.closed = (summary.statuses.closed ?? 0) + 1;
          continue;
        }
        await response.text();
        summary.sent++;
        summary.statuses[response.status] = (summary.statuses[response.status] ?? 0) + 1;
        if (response.status >= 500) summary.serverErrors.push({ status: response.status, input: describeInput(probe) });
        if (response.status >= 400) {
          const after = await rowCounts(knex);
          const changed = WATCHED_TABLES.filter((table) => after[table] !== before[table]);
          if (changed.length)
            summary.partialRows.push({ status: response.status, input: describeInput(probe), changed });
        }
      }
      log(
        `${endpoint.path.padEnd(22)} ${String(summary.sent).padStart(5)} sent  ` +
          Object.entries(summary.statuses)
            .map(([status, n]) => `${status}×${n}`)
            .join(" ") +
          `  5xx: ${summary.serverErrors.length}  rows left by refusals: ${summary.partialRows.length}`,
      );
      summaries.push(summary);
    }
    const halfWritten = await halfWrittenReports(knex);
    if (halfWritten > 0) {
      summaries.push({
        endpoint: "(filed reports without lines)",
        sent: 0,
        statuses: {},
        serverErrors: [],
        partialRows: [
          { status: 0, input: `${halfWritten} filed reports without discharges or runoff`, changed: ["events"] },
        ],
      });
    }
    return summaries;
  } finally {
    await knex.destroy();
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const argument = (name: string, fallback: string) => {
    const at = process.argv.indexOf(`--${name}`);
    return at > 0 ? process.argv[at + 1] : fallback;
  };
  const base = argument("base", `http://127.0.0.1:${process.env.PORT ?? 3000}`);
  const count = Number(argument("count", "500"));
  const started = Date.now();
  const summaries = await probeInputs({ base, count, seed: Number(argument("seed", "7")), log: console.log });
  const errors = summaries.flatMap((summary) =>
    summary.serverErrors.map((error) => ({ ...error, endpoint: summary.endpoint })),
  );
  const partial = summaries.flatMap((summary) =>
    summary.partialRows.map((row) => ({ ...row, endpoint: summary.endpoint })),
  );
  const sent = summaries.reduce((total, summary) => total + summary.sent, 0);
  console.log(
    `\n${sent} inputs to ${summaries.length} endpoints in ${((Date.now() - started) / 1000).toFixed(0)} s: ` +
      `${errors.length} answered 5xx, ${partial.length} refusals left rows behind.`,
  );
  for (const error of [...errors, ...partial].slice(0, 20)) console.log(JSON.stringify(error));
  process.exit(errors.length || partial.length ? 1 : 0);
}
