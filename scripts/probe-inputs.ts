// Bad-input probe: sends generated malformed bodies (fast-check) to every form action and JSON
// endpoint of a running Foamtally with the demo accounts, and checks that none is answered with a
// 5xx and that no refused request leaves a row behind. Not a load test: requests go one at a time.
//   tsx scripts/probe-inputs.ts [--count 500] [--base http://127.0.0.1:3000] [--seed 7]
// It reads row counts from the database the server uses (DB_* variables, as in .env). Inputs are
// built so that none can succeed in changing settings, people, layers, the fleet's foam systems or
// the stock book; drafts and API tokens of the probing accounts may be saved, as any officer's
// would be, and its own public-records request changed. A fixed set of hand-made hostile requests
// follows the generated ones.
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
  /** POST unless said. */
  method?: "PUT";
  role: ProbeRole | null;
  /** Field names the form knows; the generator mixes them with junk. */
  fields: string[];
  /** Sent first, so that no generated input can succeed where success would change shared data. */
  poison?: [string, string][];
  json?: boolean;
  file?: string;
  /** A report form: half the inputs carry a valid intent, so that the save itself sees the junk. */
  report?: boolean;
  /** JSON bodies shaped like the endpoint's own, besides the generic ones. */
  jsonBody?: fc.Arbitrary<unknown>;
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
  "release_notifications",
  "attachments",
  "foam_systems",
  "foam_system_tanks",
  "foam_system_outlets",
  "foam_system_maintenance",
  "foam_accuracy_tests",
  "stock_locations",
  "stock_lots",
  "stock_movements",
  "stock_counts",
  "stock_count_lines",
  "stock_reorder_points",
  "records_requests",
  "records_request_log",
  "records_packages",
  "records_package_files",
  "password_resets",
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

/** Records of the seeded demo that the endpoints below name in their paths. */
type Targets = {
  draftId: number;
  filedId: number;
  systemId: number;
  systemApparatusId: number;
  testId: number;
  movementId: number;
  recordsRequestId: number;
  attachments: { event: number; foamTest: number; movement: number; recordsRequest: number };
};

/** The smallest file the attachment check takes for a PDF: the probe's own upload on its own request. */
const MINIMAL_PDF = "%PDF-1.4\n1 0 obj<</Type/Catalog>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n";
const ATTACHMENT_FIELDS = ["kind", "usePosition", "file"];
const REMOVE_FIELDS = ["intent"];

function endpoints(targets: Targets): Endpoint[] {
  const { draftId, filedId, systemId, systemApparatusId, testId, movementId, recordsRequestId, attachments } = targets;
  return [
    { path: "/sign-in", role: null, fields: ["email", "password", "redirectTo"] },
    { path: "/sign-out", role: null, fields: [] },
    // A reset asked for an address no account has, and a link that was never issued.
    {
      path: "/forgot-password",
      role: null,
      fields: ["email"],
      poison: [["email", "probe-nobody@alderbend.example"]],
    },
    {
      path: "/reset-password/probe-never-issued",
      role: null,
      fields: ["newPassword", "confirmPassword"],
    },
    { path: "/events/new", role: "officer", fields: REPORT_FIELDS, report: true },
    { path: `/events/${draftId}/edit`, role: "officer", fields: REPORT_FIELDS, report: true },
    {
      path: `/events/${filedId}`,
      role: "environmental",
      fields: ["decision", "version", "comment"],
      poison: [["version", "999999999"]],
    },
    {
      path: `/events/${filedId}/notifications`,
      role: "environmental",
      fields: ["party", "partyDetail", "notifiedAt", "notifiedBy", "caseNumber", "notes"],
      poison: [["party", "probe-no-party"]],
    },
    { path: "/review", role: "environmental", fields: ["decision", "version", "comment"] },
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
    ...[
      `/apparatus/${systemApparatusId}/foam-systems/new`,
      `/apparatus/${systemApparatusId}/foam-systems/${systemId}`,
    ].map((path): Endpoint => ({
      path,
      role: "chief",
      fields: FOAM_SYSTEM_FIELDS,
      poison: [["name", "N".repeat(81)]],
    })),
    { path: "/foam-systems", role: "officer", fields: [] },
    {
      path: `/foam-systems/${systemId}`,
      role: "chief",
      fields: [...MAINTENANCE_FIELDS, ...ACCURACY_TEST_FIELDS],
      // Neither a maintenance record nor a test can be dated, so none is recorded on the demo fleet.
      poison: [
        ["performedAt", "probe"],
        ["testedAt", "probe"],
      ],
    },
    { path: `/foam-systems/${systemId}/tests/${testId}`, role: "chief", fields: [] },
    {
      path: "/api/foam-tests/compute",
      role: "officer",
      fields: ["method", "foamClass", "ratedPercent", "calibration", "sampleReading", "concentrateGal", "waterGal"],
      json: true,
      jsonBody: accuracyTestBody,
    },
    { path: `/api/foam-tests/${testId}/attachments`, role: "chief", fields: ATTACHMENT_FIELDS, file: "file" },
    { path: `/foam-tests/${testId}/attachments/${attachments.foamTest}`, role: "chief", fields: REMOVE_FIELDS },
    {
      path: "/products/new",
      role: "environmental",
      fields: ["name", "maker", "foamClass", "foamType", "nominalPercents", "pfasContaining", "pfasContent"],
      poison: [["foamType", "not-a-type"]],
      file: "safetySheet",
    },
    {
      path: "/stock",
      role: "environmental",
      fields: [...RECEIVE_FIELDS, ...LOCATION_FIELDS, ...REORDER_FIELDS],
      // A receipt at a stale version, a location of no kind, a reorder point of no location.
      poison: [
        ["version", "999999999"],
        ["kind", "probe-no-kind"],
        ["locationId", "999999999"],
      ],
    },
    {
      path: "/stock/movements",
      role: "environmental",
      fields: MOVE_FIELDS,
      poison: [["version", "999999999"]],
    },
    {
      path: "/stock/counts",
      role: "chief",
      fields: COUNT_FIELDS,
      poison: [["version", "999999999"]],
    },
    { path: "/api/stock/movements", role: "environmental", fields: MOVE_FIELDS, json: true },
    {
      path: `/api/stock/movements/${movementId}/attachments`,
      role: "environmental",
      fields: ATTACHMENT_FIELDS,
      file: "file",
    },
    {
      path: `/stock/movements/${movementId}/attachments/${attachments.movement}`,
      role: "environmental",
      fields: REMOVE_FIELDS,
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
      fields: ["intent", "userId", "name", "email", "password", "roles", "active", "stationId"],
      // A new account's email already exists; an update, a reset link or ended sessions name no account.
      poison: [
        ["email", ACCOUNTS.admin],
        ["userId", "999999999"],
      ],
    },
    {
      path: "/admin/outbox",
      role: "admin",
      fields: ["intent", "id"],
      poison: [["id", "999999999"]],
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
    {
      path: "/records-requests",
      role: null,
      fields: [
        "name",
        "email",
        "phone",
        "organisation",
        "description",
        "from",
        "to",
        "address",
        "lat",
        "lon",
        "website",
      ],
      // The hidden field robots fill: such a request is never stored.
      poison: [["website", "probe"]],
    },
    {
      path: `/records/${recordsRequestId}`,
      role: "admin",
      fields: [
        "intent",
        "status",
        "note",
        "assigneeId",
        "days",
        "reason",
        "packageId",
        "from",
        "to",
        "kind",
        "station",
        "foamClass",
        "basin",
        "radiusM",
        "redactPersonnel",
        "redactNotes",
        "redactLocations",
      ],
      // The probe's own request may change; no package is built or sent.
      poison: [
        ["radiusM", "-1"],
        ["packageId", "999999999"],
      ],
    },
    {
      path: `/api/records-requests/${recordsRequestId}/attachments`,
      role: "admin",
      fields: ATTACHMENT_FIELDS,
      file: "file",
    },
    {
      path: `/records/${recordsRequestId}/attachments/${attachments.recordsRequest}`,
      role: "admin",
      fields: REMOVE_FIELDS,
    },
    { path: "/api/totals", role: "officer", fields: ["discharges"], json: true },
    { path: "/api/events", role: "officer", fields: REPORT_FIELDS, json: true, jsonBody: reportBody },
    {
      path: `/api/events/${draftId}`,
      method: "PUT",
      role: "officer",
      fields: REPORT_FIELDS,
      json: true,
      jsonBody: reportBody,
    },
    { path: `/api/events/${draftId}/attachments`, role: "officer", fields: ATTACHMENT_FIELDS, file: "file" },
    { path: `/attachments/${attachments.event}`, role: "environmental", fields: REMOVE_FIELDS },
  ];
}

const FOAM_SYSTEM_FIELDS = [
  "name",
  "systemType",
  "percentOf",
  "minConcentrateGpm",
  "maxConcentrateGpm",
  "waterFlowMinGpm",
  "waterFlowMaxGpm",
  "tankName",
  "tankCapacityGal",
  "tankProductId",
  "outlets",
  "active",
];
const MAINTENANCE_FIELDS = [
  "intent",
  "kind",
  "flushReason",
  "performedAt",
  "notes",
  "waterGal",
  "concentrateDisposedGal",
  "eventNumber",
  "fromProductId",
  "toProductId",
  "rinseProcedure",
  "verificationResult",
];
const ACCURACY_TEST_FIELDS = [
  "testedAt",
  "method",
  "foamClass",
  "productId",
  "ratedPercent",
  "setPercent",
  "waterFlowGpm",
  "calibration[0].percent",
  "calibration[1].reading",
  "calibration[999999].percent",
  "sampleReading",
  "concentrateGal",
];
const RECEIVE_FIELDS = [
  "intent",
  "locationId",
  "version",
  "productId",
  "lotNumber",
  "manufacturedOn",
  "container",
  "containerGal",
  "containerCount",
  "supplier",
  "deliveryReference",
  "receivedOn",
];
const LOCATION_FIELDS = ["kind", "name", "stationId", "apparatusId"];
const REORDER_FIELDS = ["reorderGal"];
const MOVE_FIELDS = [
  "kind",
  "locationId",
  "version",
  "toLocationId",
  "productId",
  "lotId",
  "gal",
  "at",
  "reason",
  "reference",
];
const COUNT_FIELDS = [
  "locationId",
  "version",
  "countedAt",
  "reason",
  "lines[0].productId",
  "lines[0].lotId",
  "lines[0].countedGal",
  "lines[1].countedGal",
  "lines[199].countedGal",
  "lines[200].countedGal",
  "lines[999999].countedGal",
];

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
  "send-reset",
  "end-sessions",
  "test",
  "maintenance",
  "receive",
  "add-location",
  "reorder",
  "transferred",
  "disposed",
  "assign",
  "extend",
  "build",
  "send",
  "2026-02-30T25:61",
  "2026-02-30T10:00",
  "2026-02-30",
  "0999-12-31",
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

const anyNumber = fc.oneof(fc.double(), fc.integer(), text, fc.constant(null));
const accuracyTestBody: fc.Arbitrary<unknown> = fc.record(
  {
    method: fc.oneof(fc.constantFrom("refractometer", "conductivity", "flow"), text),
    foamClass: fc.oneof(fc.constantFrom("A", "B"), text),
    ratedPercent: anyNumber,
    calibration: fc.oneof(
      fc.array(fc.record({ percent: anyNumber, reading: anyNumber }, { requiredKeys: [] }), { maxLength: 25 }),
      fc.jsonValue({ maxDepth: 2 }),
    ),
    sampleReading: anyNumber,
    concentrateGal: anyNumber,
    waterGal: anyNumber,
  },
  { requiredKeys: [] },
);
const reportBody: fc.Arbitrary<unknown> = fc.record(
  {
    intent: fc.oneof(fc.constantFrom("save-draft", "file"), text),
    version: anyNumber,
    number: text,
    kind: fc.oneof(fc.constantFrom("incident", "training", "test", "flush"), text),
    startedAt: text,
    latitude: anyNumber,
    longitude: anyNumber,
    stationId: anyNumber,
    discharges: fc.oneof(
      fc.array(fc.record({ flow: anyNumber, minutes: anyNumber, productId: anyNumber, percent: anyNumber }), {
        maxLength: 6,
      }),
      fc.jsonValue({ maxDepth: 2 }),
    ),
    dispositions: fc.jsonValue({ maxDepth: 3 }),
  },
  { requiredKeys: [] },
);

function fieldName(endpoint: Endpoint) {
  const lists = Object.entries(LINE_FIELDS);
  return fc.oneof(
    { weight: 4, arbitrary: fc.constantFrom(...(endpoint.fields.length ? endpoint.fields : ["intent"])) },
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
  const typedJson = (endpoint.jsonBody ?? fc.constant(null)).map((value): Body => ({
    label: "typed json",
    contentType: "application/json",
    body: JSON.stringify(value),
  }));
  return fc.oneof(
    { weight: endpoint.jsonBody ? 10 : 0, arbitrary: typedJson },
    { weight: 10, arbitrary: urlencoded },
    { weight: 4, arbitrary: multipart },
    { weight: endpoint.json ? 10 : 2, arbitrary: json },
    { weight: 1, arbitrary: deepJson },
    { weight: endpoint.json ? 2 : 0, arbitrary: longList },
    { weight: endpoint.json && !endpoint.jsonBody ? 10 : 0, arbitrary: totals },
    { weight: 1, arbitrary: plain },
    { weight: 1, arbitrary: none },
    { weight: 1, arbitrary: brokenMultipart },
    { weight: 1, arbitrary: brokenUrlencoded },
    { weight: 1, arbitrary: binary },
    { weight: 1, arbitrary: oversized },
  );
}

type ProbeRequest = { role: ProbeRole | null; method: "GET" | "POST" | "PUT"; path: string; probe: Body };

/** The summary of the fixed inputs below. */
export const HAND_MADE = "(hand-made inputs)";

/**
 * Fixed hostile requests to the foam-system, stock, records and attachment routes: ids that are not
 * record ids or name another record's child, roles that may not write there, sparse and oversized
 * lists, huge bodies, wrong types, dates no calendar has. None may be answered with a 5xx or leave
 * rows when refused; stale versions and poison fields keep any accepted one off the demo's data.
 */
function handMadeRequests(targets: Targets): ProbeRequest[] {
  const { systemId, systemApparatusId, testId, movementId, recordsRequestId, attachments, filedId } = targets;
  const form = (body: string): Body => ({
    label: "form",
    contentType: "application/x-www-form-urlencoded",
    body,
  });
  const json = (value: unknown): Body => ({
    label: "json",
    contentType: "application/json",
    body: JSON.stringify(value),
  });
  const none: Body = { label: "no body" };
  const requests: ProbeRequest[] = [];
  const add = (role: ProbeRole | null, method: ProbeRequest["method"], path: string, probe: Body = none) =>
    requests.push({ role, method, path, probe });

  for (const bad of ["abc", "1e3", "-1", "0x10", "0", "4294967296", "99999999999999999999", "%00", "4.0"]) {
    add("chief", "GET", `/foam-systems/${bad}`);
    add("chief", "POST", `/foam-systems/${bad}`, form("intent=maintenance&performedAt=probe"));
    add("chief", "GET", `/foam-systems/${systemId}/tests/${bad}`);
    add("chief", "GET", `/foam-systems/${bad}/tests/${testId}/record.pdf`);
    add("chief", "GET", `/apparatus/${bad}/foam-systems/${systemId}`);
    add("chief", "POST", `/apparatus/${systemApparatusId}/foam-systems/${bad}`, form(`name=${"N".repeat(81)}`));
    add("chief", "POST", `/api/foam-tests/${bad}/attachments`);
    add("chief", "POST", `/foam-tests/${testId}/attachments/${bad}`, form("intent=keep"));
    add("environmental", "POST", `/api/stock/movements/${bad}/attachments`);
    add("environmental", "POST", `/stock/movements/${movementId}/attachments/${bad}`, form("intent=keep"));
    add("admin", "POST", `/records/${bad}`, form("intent=status&status=probe"));
    add("admin", "POST", `/api/records-requests/${bad}/attachments`);
    add(null, "POST", `/reset-password/${bad}`, form("newPassword=a&confirmPassword=a"));
  }
  for (const query of [
    "location=abc",
    "location=1e3",
    "product=99999999999",
    "kind=nope",
    "from=2026-02-30",
    "event=abc",
  ]) {
    for (const page of ["/stock", "/stock/movements", "/stock/counts", "/api/stock", "/api/stock/movements"]) {
      add("environmental", "GET", `${page}?${query}`);
    }
  }
  // Roles that may not write here, and children of another record.
  add("officer", "POST", "/stock", form("intent=receive&version=999999999"));
  add("officer", "POST", "/stock/movements", form("kind=transferred&version=999999999"));
  add("officer", "POST", `/apparatus/${systemApparatusId}/foam-systems/new`, form("name=x"));
  add("officer", "POST", `/records/${recordsRequestId}`, form("intent=status&status=closed"));
  add("officer", "POST", `/api/records-requests/${recordsRequestId}/attachments`);
  add("environmental", "POST", `/foam-systems/${systemId}`, form("intent=maintenance&performedAt=probe"));
  add("chief", "POST", `/records/${recordsRequestId}`, form("intent=status&status=closed"));
  add("chief", "POST", `/foam-tests/${testId}/attachments/${attachments.event}`, form("intent=remove"));
  add(
    "environmental",
    "POST",
    `/stock/movements/${movementId}/attachments/${attachments.event}`,
    form("intent=remove"),
  );
  add("admin", "POST", `/records/${recordsRequestId}/attachments/${attachments.movement}`, form("intent=remove"));
  add("chief", "GET", `/foam-systems/${systemId + 1_000_000}/tests/${testId}`);
  add(null, "POST", "/api/foam-tests/compute", json({ method: "flow" }));
  // Sparse, long and oversized lists; wrong types.
  const count = `locationId=1&version=999999999&countedAt=2026-11-30T10:00`;
  add("chief", "POST", "/stock/counts", form(`${count}&lines[999999].productId=1&lines[999999].countedGal=1`));
  add("chief", "POST", "/stock/counts", form(`${count}&lines[0].productId=1&lines[5000].countedGal=1`));
  add("chief", "POST", "/stock/counts", form(`${count}&lines[-1].productId=1&lines[1e3].countedGal=1`));
  add(
    "chief",
    "POST",
    "/stock/counts",
    form(
      `${count}&${Array.from({ length: 201 }, (_, i) => `lines[${i}].productId=1&lines[${i}].countedGal=1`).join("&")}`,
    ),
  );
  const test = "intent=test&testedAt=probe&method=refractometer&foamClass=A&ratedPercent=0.5";
  add("chief", "POST", `/foam-systems/${systemId}`, form(`${test}&calibration[999999].percent=1`));
  add(
    "chief",
    "POST",
    `/foam-systems/${systemId}`,
    form(
      `${test}&${Array.from({ length: 25 }, (_, i) => `calibration[${i}].percent=${i}&calibration[${i}].reading=${i}`).join("&")}`,
    ),
  );
  add("chief", "POST", `/foam-systems/${systemId}`, form(`${test}&calibration=1&calibration[0]=x`));
  add("environmental", "POST", "/stock", json({ intent: "receive" }));
  add("environmental", "POST", "/stock", form("intent=receive&intent=reorder&locationId=abc&productId[]=1"));
  add(
    "environmental",
    "POST",
    "/stock",
    form("intent=reorder&locationId=4294967296&productId=4294967295&reorderGal=1"),
  );
  add("environmental", "POST", "/stock/movements", form("kind=sampled&version=4294967296&locationId=0x10&gal=NaN"));
  add("environmental", "POST", "/stock/movements", form(`reason=${"x".repeat(900_000)}`));
  add("environmental", "POST", "/stock/movements", form(`a=${"x".repeat(1_100_000)}`));
  add(
    "chief",
    "POST",
    `/foam-systems/${systemId}`,
    form(`intent=maintenance&performedAt=probe&notes=${"x".repeat(900_000)}`),
  );
  for (const day of ["2026-02-30", "0999-12-31", "9999-12-31"]) {
    add(
      "environmental",
      "POST",
      "/stock",
      form(
        `intent=receive&locationId=1&productId=1&lotNumber=probe&container=drum&containerGal=1&containerCount=1&receivedOn=${day}&version=999999999`,
      ),
    );
    add(
      "environmental",
      "POST",
      `/events/${filedId}/notifications`,
      form(`party=probe&notifiedAt=${day}T23:59&notifiedBy=x`),
    );
  }
  const curve = { method: "refractometer", foamClass: "A", ratedPercent: 0.5, sampleReading: 1 };
  for (const body of [
    { ...curve, calibration: { 999999: { percent: 1, reading: 1 } } },
    { ...curve, calibration: Array.from({ length: 100 }, (_, i) => ({ percent: i, reading: i })) },
    {
      ...curve,
      calibration: [
        { percent: 0, reading: 0 },
        { percent: 1, reading: 1e-300 },
      ],
    },
    { method: "flow", foamClass: "B", ratedPercent: "3", concentrateGal: "1", waterGal: [1] },
    { method: "flow", foamClass: "B", ratedPercent: 3, concentrateGal: 1e-320, waterGal: 1e-320 },
    [1, 2, 3],
  ]) {
    add("officer", "POST", "/api/foam-tests/compute", json(body));
  }
  add("officer", "POST", "/api/foam-tests/compute", {
    label: "2 MB json",
    contentType: "application/json",
    body: "x".repeat(2_000_000),
  });
  add("chief", "POST", `/api/foam-tests/${testId}/attachments`, {
    label: "two files",
    contentType: "multipart/form-data; boundary=x",
    body:
      '--x\r\nContent-Disposition: form-data; name="file"; filename="a.pdf"\r\n\r\n%PDF\r\n' +
      '--x\r\nContent-Disposition: form-data; name="file"; filename="b.pdf"\r\n\r\n%PDF\r\n--x--\r\n',
  });
  add("admin", "POST", `/records/${recordsRequestId}`, form("intent=assign&assigneeId=99999999999999999999"));
  add("admin", "POST", `/records/${recordsRequestId}`, form("intent=send&packageId=4294967296&status=fulfilled"));
  add("admin", "POST", `/records/${recordsRequestId}`, form("intent=build&radiusM=-1&station=4294967296"));
  add("admin", "POST", `/records/${recordsRequestId}`, form("intent=extend&days=1e3&reason=probe-reason"));
  add("admin", "POST", "/admin/users", form("intent=send-reset&userId=4294967296"));
  add("admin", "POST", "/admin/users", form("intent=end-sessions&userId=abc"));
  add("environmental", "POST", "/admin/users", form("intent=send-reset&userId=1"));
  add("admin", "POST", "/admin/outbox", form("intent=retry&id=4294967296"));
  add("admin", "POST", "/admin/outbox", form("intent=discard&id=1e3"));
  add(null, "POST", "/forgot-password", form("email[]=a&email[]=b"));
  add(null, "POST", `/reset-password/${"x".repeat(5_000)}`, form("newPassword=a&confirmPassword=a"));
  return requests;
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

/**
 * The demo's records that the new endpoints name, and a records request of the probe's own (its
 * changes stay on that request).
 */
async function probeTargets(
  knex: Knex,
  base: string,
  cookies: Map<ProbeRole | null, string>,
  draftId: number,
  filedId: number,
): Promise<Targets & { ownUploads: { path: string; role: ProbeRole }[] }> {
  const firstAttachment = async (subject: string) =>
    (await knex("attachments").where({ subject }).whereNull("removed_at").orderBy("id").first("id", "subject_id")) as
      { id: number; subject_id: number } | undefined;
  const ownUploads: { path: string; role: ProbeRole }[] = [];
  // Where the seed attached nothing (its file store was down), the probe aims at a file of its own,
  // removed again when it ends.
  const attachmentOf = async (subject: string, role: ProbeRole, ownerId: () => Promise<number>, upload: string) => {
    const found = await firstAttachment(subject);
    if (found) return found;
    const subjectId = await ownerId();
    const id = (await attachPdf(base, cookies.get(role)!, upload.replace(":id", String(subjectId)))).id;
    return { id, subject_id: subjectId, own: role };
  };
  const firstId = async (table: string) => {
    const row = await knex(table).orderBy("id").first("id");
    if (!row) throw new Error(`the database has no ${table}: seed the demo data first`);
    return row.id as number;
  };
  const eventAttachment = await attachmentOf("event", "officer", async () => draftId, "/api/events/:id/attachments");
  const testAttachment = await attachmentOf(
    "foam_test",
    "chief",
    () => firstId("foam_accuracy_tests"),
    "/api/foam-tests/:id/attachments",
  );
  const movementAttachment = await attachmentOf(
    "stock_movement",
    "environmental",
    // Only a disposal takes a file (the hauler's manifest).
    async () => {
      const row = await knex("stock_movements").where({ kind: "disposed" }).orderBy("id").first("id");
      if (!row) throw new Error("the database has no disposal in its stock book: seed the demo data first");
      return row.id as number;
    },
    "/api/stock/movements/:id/attachments",
  );
  if ("own" in eventAttachment) ownUploads.push({ path: `/attachments/${eventAttachment.id}`, role: "officer" });
  if ("own" in testAttachment) {
    ownUploads.push({
      path: `/foam-tests/${testAttachment.subject_id}/attachments/${testAttachment.id}`,
      role: "chief",
    });
  }
  if ("own" in movementAttachment) {
    ownUploads.push({
      path: `/stock/movements/${movementAttachment.subject_id}/attachments/${movementAttachment.id}`,
      role: "environmental",
    });
  }
  const test = await knex("foam_accuracy_tests").where({ id: testAttachment.subject_id }).first("foam_system_id");
  const system = await knex("foam_systems").where({ id: test.foam_system_id }).first("id", "apparatus_id");
  const request =
    (await knex("records_requests").where({ requester_email: PROBE_REQUESTER }).first("id")) ??
    (await fileRecordsRequest(knex, base));
  const requestAttachment =
    (await knex("attachments")
      .where({ subject: "records_request", subject_id: request.id })
      .whereNull("removed_at")
      .first("id")) ??
    (await attachPdf(base, cookies.get("admin")!, `/api/records-requests/${request.id}/attachments`));
  return {
    draftId,
    filedId,
    systemId: system.id,
    systemApparatusId: system.apparatus_id,
    testId: testAttachment.subject_id,
    movementId: movementAttachment.subject_id,
    recordsRequestId: request.id,
    attachments: {
      event: eventAttachment.id,
      foamTest: testAttachment.id,
      movement: movementAttachment.id,
      recordsRequest: requestAttachment.id,
    },
    ownUploads,
  };
}

const PROBE_REQUESTER = "probe@alderbend.example";

/** The probe's own public-records request, filed as anyone would; an earlier run's is used again. */
async function fileRecordsRequest(knex: Knex, base: string): Promise<{ id: number }> {
  const received = await fetch(`${base}/records-requests`, {
    method: "POST",
    body: new URLSearchParams({
      name: "Bad-input probe",
      email: PROBE_REQUESTER,
      description: "Records asked for by the bad-input probe (demo data).",
    }),
    redirect: "manual",
  });
  const trackingCode = received.headers.get("Location")?.match(/\/records-requests\/([^/?]+)/)?.[1];
  const request = trackingCode
    ? await knex("records_requests").where({ tracking_code: trackingCode }).first("id")
    : null;
  if (!request) throw new Error(`could not file the probe's records request (${received.status})`);
  return request;
}

/** Attaches a one-page PDF of the probe's own, for a remove endpoint to aim at. */
async function attachPdf(base: string, cookie: string, path: string): Promise<{ id: number }> {
  const upload = new FormData();
  upload.append("file", new File([MINIMAL_PDF], "probe.pdf", { type: "application/pdf" }));
  const attached = await fetch(`${base}${path}`, { method: "POST", headers: { Cookie: cookie }, body: upload });
  if (attached.status !== 201) throw new Error(`could not attach the probe's file at ${path} (${attached.status})`);
  return (await attached.json()) as { id: number };
}

/**
 * The allowances per address that the public forms count (records requests, password resets): the
 * probe's hundreds of refused requests from one address use them up, so they are put back as they
 * were when it ends, and the people and tests after it are not made to wait an hour.
 */
const ALLOWANCE_KEYS = ["records-request:%", "password-reset-%"];

async function keptAllowances(knex: Knex) {
  const rows = await knex("rate_limits").where((where) => {
    for (const key of ALLOWANCE_KEYS) where.orWhere("key", "like", key);
  });
  return async () => {
    await knex("rate_limits")
      .where((where) => {
        for (const key of ALLOWANCE_KEYS) where.orWhere("key", "like", key);
      })
      .delete();
    if (rows.length) await knex("rate_limits").insert(rows);
  };
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
  const restoreAllowances = await keptAllowances(knex);
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
    const targets = await probeTargets(knex, options.base, cookies, draftId, filed.id);

    const summaries: ProbeSummary[] = [];
    const batches: { label: string; requests: ProbeRequest[] }[] = endpoints(targets).map((endpoint, position) => ({
      label: endpoint.path,
      requests: fc
        .sample(bodies(endpoint), { numRuns: options.count, seed: (options.seed ?? 7) + position })
        .map((probe) => ({ role: endpoint.role, method: endpoint.method ?? "POST", path: endpoint.path, probe })),
    }));
    batches.push({ label: HAND_MADE, requests: handMadeRequests(targets) });
    for (const batch of batches) {
      const summary: ProbeSummary = {
        endpoint: batch.label,
        sent: 0,
        statuses: {},
        serverErrors: [],
        partialRows: [],
      };
      for (const { role, method, path, probe } of batch.requests) {
        const before = await rowCounts(knex);
        const headers: Record<string, string> = {};
        if (probe.contentType) headers["Content-Type"] = probe.contentType;
        const cookie = cookies.get(role);
        if (cookie) headers.Cookie = cookie;
        const response = await fetch(`${options.base}${path}`, {
          method,
          headers,
          body: method === "GET" ? undefined : probe.body,
          redirect: "manual",
        }).catch(() => null);
        const input = batch.label === HAND_MADE ? `${method} ${path} ${describeInput(probe)}` : describeInput(probe);
        if (!response) {
          // The server may close a connection it refused before the whole body was sent; it must
          // still be answering.
          const alive = await fetch(`${options.base}/sign-in`).then(
            (answer) => answer.ok,
            () => false,
          );
          if (!alive) throw new Error(`the server stopped answering after ${input}`);
          summary.sent++;
          summary.statuses.closed = (summary.statuses.closed ?? 0) + 1;
          continue;
        }
        await response.text();
        summary.sent++;
        summary.statuses[response.status] = (summary.statuses[response.status] ?? 0) + 1;
        if (response.status >= 500) summary.serverErrors.push({ status: response.status, input });
        if (response.status >= 400) {
          const after = await rowCounts(knex);
          const changed = WATCHED_TABLES.filter((table) => after[table] !== before[table]);
          if (changed.length) summary.partialRows.push({ status: response.status, input, changed });
        }
      }
      log(
        `${batch.label.padEnd(44)} ${String(summary.sent).padStart(5)} sent  ` +
          Object.entries(summary.statuses)
            .map(([status, n]) => `${status}×${n}`)
            .join(" ") +
          `  5xx: ${summary.serverErrors.length}  rows left by refusals: ${summary.partialRows.length}`,
      );
      summaries.push(summary);
    }
    for (const { path, role } of targets.ownUploads) {
      await fetch(`${options.base}${path}`, {
        method: "POST",
        headers: { Cookie: cookies.get(role)!, "Content-Type": "application/x-www-form-urlencoded" },
        body: "intent=remove",
      });
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
    await restoreAllowances();
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
