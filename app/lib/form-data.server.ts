import type { z } from "zod";
import { apiError, httpError } from "./http.server";
import { FORM_BODY_MAX_BYTES, JSON_BODY_MAX_BYTES } from "./request-limits";

/**
 * Every action reads its body here before conform or zod sees it. The body is read with a byte
 * limit, and only the keys the form's zod schema knows are kept, so that a name such as
 * `discharges[1000000000].flow` can never make the parser build a huge array, and no reply echoes
 * more than a valid form could hold.
 */

/** What a form may contain, derived from its zod schema. */
export type FormShape =
  | { kind: "value"; file: boolean; maxLength: number }
  | { kind: "object"; fields: Map<string, FormShape> }
  | { kind: "array"; element: FormShape; max: number };

/** Arrays without their own `.max()` take at most this many entries. */
export const DEFAULT_ARRAY_MAX = 50;
/** A text field's cap when its schema gives no maximum; with one, twice the maximum (at least 1,000). */
const DEFAULT_TEXT_CAP = 10_000;
const MIN_FIELD_CAP = 1_000;
/** Entries a form may carry that its schema does not know (dropped, but counted). */
const UNKNOWN_ENTRY_SLACK = 100;
/** conform's own field for list buttons (insert, remove) when a form is sent without JavaScript. */
const CONFORM_INTENT = "__INTENT__";

type ZodDef = { type: string; [key: string]: unknown };
type Schemaish = { _zod: { def: ZodDef } };

function defOf(schema: unknown): ZodDef {
  return (schema as Schemaish)._zod.def;
}

function checkValue(def: ZodDef, name: "max_length" | "length_equals"): number | undefined {
  for (const check of (def.checks as Schemaish[] | undefined) ?? []) {
    const checkDef = check._zod.def as { check?: string; maximum?: number; length?: number };
    if (checkDef.check === name) return name === "max_length" ? checkDef.maximum : checkDef.length;
  }
  return undefined;
}

function maxLengthOf(def: ZodDef): number | undefined {
  return checkValue(def, "max_length") ?? checkValue(def, "length_equals");
}

function merge(a: FormShape | undefined, b: FormShape | undefined): FormShape | undefined {
  if (!a) return b;
  if (!b) return a;
  if (a.kind === "object" && b.kind === "object") {
    const fields = new Map(a.fields);
    for (const [key, shape] of b.fields) fields.set(key, merge(fields.get(key), shape)!);
    return { kind: "object", fields };
  }
  if (a.kind === "array" && b.kind === "array") {
    return { kind: "array", element: merge(a.element, b.element)!, max: Math.max(a.max, b.max) };
  }
  if (a.kind === "value" && b.kind === "value") {
    return { kind: "value", file: a.file || b.file, maxLength: Math.max(a.maxLength, b.maxLength) };
  }
  // A value and a list or group under one name: the richer shape wins.
  return a.kind === "value" ? b : a;
}

const value = (maxLength: number, file = false): FormShape => ({ kind: "value", file, maxLength });

/** Walks a zod 4 schema; `undefined` means the schema says nothing about the form's keys here. */
function shapeOf(schema: unknown, depth = 0): FormShape | undefined {
  if (depth > 32) return undefined;
  const def = defOf(schema);
  const inner = (key: string) => shapeOf(def[key], depth + 1);
  switch (def.type) {
    case "object": {
      const fields = new Map<string, FormShape>();
      for (const [key, field] of Object.entries(def.shape as Record<string, unknown>)) {
        fields.set(key, shapeOf(field, depth + 1) ?? value(DEFAULT_TEXT_CAP));
      }
      return { kind: "object", fields };
    }
    case "array": {
      const element = inner("element") ?? value(DEFAULT_TEXT_CAP);
      return { kind: "array", element, max: maxLengthOf(def) ?? DEFAULT_ARRAY_MAX };
    }
    case "tuple": {
      const items = (def.items as unknown[]).map((item) => shapeOf(item, depth + 1));
      const element = items.reduce<FormShape | undefined>(merge, undefined) ?? value(DEFAULT_TEXT_CAP);
      return { kind: "array", element, max: items.length };
    }
    case "optional":
    case "nullable":
    case "default":
    case "prefault":
    case "catch":
    case "readonly":
    case "nonoptional":
    case "success":
      return inner("innerType");
    case "pipe":
      return merge(inner("in"), inner("out"));
    case "union":
      return (def.options as unknown[]).map((option) => shapeOf(option, depth + 1)).reduce(merge, undefined);
    case "intersection":
      return merge(inner("left"), inner("right"));
    case "lazy":
      return shapeOf((def.getter as () => unknown)(), depth + 1);
    case "string": {
      const max = maxLengthOf(def);
      return value(max == null ? DEFAULT_TEXT_CAP : Math.max(2 * max, MIN_FIELD_CAP));
    }
    case "file":
      return value(MIN_FIELD_CAP, true);
    case "number":
    case "int":
    case "bigint":
    case "boolean":
    case "enum":
    case "literal":
    case "date":
    case "null":
    case "undefined":
    case "nan":
      return value(MIN_FIELD_CAP);
    default:
      // transform, any, unknown, custom, record…: nothing to add.
      return undefined;
  }
}

/**
 * The keys a form may send: the union of the schemas' shapes (one form may serve several intents),
 * plus plain text fields named in `fields`.
 */
export function formShape(schemas: unknown | readonly unknown[], fields: readonly string[] = []): FormShape {
  const list = Array.isArray(schemas) ? schemas : [schemas];
  let shape: FormShape = { kind: "object", fields: new Map([[CONFORM_INTENT, value(DEFAULT_TEXT_CAP)]]) };
  for (const schema of list) shape = merge(shape, shapeOf(schema))!;
  for (const field of fields)
    shape = merge(shape, { kind: "object", fields: new Map([[field, value(MIN_FIELD_CAP)]]) })!;
  return shape;
}

/** How many entries the fullest valid form sends. */
function slotsOf(shape: FormShape): number {
  if (shape.kind === "value") return 1;
  if (shape.kind === "array") return Math.min(1_000_000, shape.max * slotsOf(shape.element));
  let total = 0;
  for (const field of shape.fields.values()) total += slotsOf(field);
  return Math.min(1_000_000, total);
}

/** Why a body was refused: the status and a short sentence, never the body itself. */
export class BodyRefused extends Error {
  constructor(
    readonly status: 400 | 411 | 413 | 415,
    message: string,
  ) {
    super(message);
  }
}

const megabytes = (bytes: number) => `${Math.round((bytes / 1024 / 1024) * 10) / 10} MB`;

/** The body's bytes, refused with 413 past `maxBytes`: the declared length first, then what arrives. */
export async function readBodyBytes(request: Request, maxBytes: number): Promise<Uint8Array<ArrayBuffer>> {
  const tooLarge = () => new BodyRefused(413, `The request is larger than ${megabytes(maxBytes)} and was not read.`);
  const declared = request.headers.get("Content-Length");
  if (declared != null && Number(declared) > maxBytes) throw tooLarge();
  if (!request.body) return new Uint8Array(new ArrayBuffer(0));
  if (request.bodyUsed) throw new Error("the request body was already read");
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value: chunk } = await reader.read();
    if (done) break;
    total += chunk.byteLength;
    if (total > maxBytes) {
      // Stop reading: the rest of the body is left unread and the connection is not kept.
      reader.cancel().catch(() => {});
      throw tooLarge();
    }
    chunks.push(chunk);
  }
  const bytes = new Uint8Array(total);
  let offset = 0;
  for (const chunk of chunks) {
    bytes.set(chunk, offset);
    offset += chunk.byteLength;
  }
  return bytes;
}

// The same path grammar conform uses: `a.b`, `a[0].b`, `a[]`.
const PATH_TOKEN = /([^.[\]]+)|\[(\d*)\]/g;

function pathSegments(name: string): (string | number)[] | null {
  const segments: (string | number)[] = [];
  let last = 0;
  PATH_TOKEN.lastIndex = 0;
  for (let match = PATH_TOKEN.exec(name); match; match = PATH_TOKEN.exec(name)) {
    if (match.index !== last && !(match.index === last + 1 && name[last] === ".")) return null;
    if (match[1] !== undefined) segments.push(match[1]);
    else if (match[2] === "") return null;
    else segments.push(match[2].length > 9 ? Number.MAX_SAFE_INTEGER : Number(match[2]));
    last = PATH_TOKEN.lastIndex;
  }
  return last === name.length && segments.length > 0 ? segments : null;
}

function listName(segments: (string | number)[], upTo: number): string {
  return segments
    .slice(0, upTo)
    .filter((segment) => typeof segment === "string")
    .join(".");
}

type Placement = { keep: true; leaf: Extract<FormShape, { kind: "value" }>; repeatable: number } | { keep: false };

/** Where an entry's name lands in the shape; throws when an index passes its list's maximum. */
function place(shape: FormShape, segments: (string | number)[]): Placement {
  let current = shape;
  for (let index = 0; index < segments.length; index++) {
    const segment = segments[index];
    if (current.kind === "object") {
      if (typeof segment !== "string") return { keep: false };
      const next = current.fields.get(segment);
      if (!next) return { keep: false };
      current = next;
    } else if (current.kind === "array") {
      if (typeof segment !== "number") return { keep: false };
      if (segment >= current.max) {
        throw new BodyRefused(400, `The form has more than ${current.max} entries for ${listName(segments, index)}.`);
      }
      current = current.element;
    } else {
      return { keep: false };
    }
  }
  if (current.kind === "value") return { keep: true, leaf: current, repeatable: 1 };
  // A list of plain values may also come as one name repeated (checkboxes, multiple selects).
  if (current.kind === "array" && current.element.kind === "value") {
    return { keep: true, leaf: current.element, repeatable: current.max };
  }
  return { keep: false };
}

/** Keeps the entries the shape allows, in order; refuses a form past its bounds with 400. */
export function boundedFormData(entries: Iterable<[string, FormDataEntryValue]>, shape: FormShape): FormData {
  const maxEntries = slotsOf(shape) + UNKNOWN_ENTRY_SLACK;
  const repeats = new Map<string, number>();
  const kept = new FormData();
  let count = 0;
  for (const [name, entry] of entries) {
    if (++count > maxEntries) throw new BodyRefused(400, `The form has more than ${maxEntries} fields.`);
    const segments = name.length <= 500 ? pathSegments(name) : null;
    if (!segments) continue;
    const placement = place(shape, segments);
    if (!placement.keep) continue;
    const { leaf, repeatable } = placement;
    if (typeof entry === "string") {
      if (entry.length > leaf.maxLength) {
        throw new BodyRefused(400, `The field ${name.slice(0, 80)} is longer than ${leaf.maxLength} characters.`);
      }
    } else if (!leaf.file) {
      continue;
    }
    const seen = (repeats.get(name) ?? 0) + 1;
    if (seen > repeatable) {
      throw new BodyRefused(400, `The field ${name.slice(0, 80)} is sent more than ${repeatable} times.`);
    }
    repeats.set(name, seen);
    kept.append(name, entry);
  }
  return kept;
}

function mediaType(request: Request): string {
  return (request.headers.get("Content-Type") ?? "").split(";")[0].trim().toLowerCase();
}

/** Reads and bounds a form body; throws `BodyRefused`. */
export async function readBoundedForm(
  request: Request,
  shape: FormShape,
  maxBytes = FORM_BODY_MAX_BYTES,
): Promise<FormData> {
  const type = mediaType(request);
  if (type !== "application/x-www-form-urlencoded" && type !== "multipart/form-data") {
    throw new BodyRefused(415, "Send the form as application/x-www-form-urlencoded or multipart/form-data.");
  }
  const bytes = await readBodyBytes(request, maxBytes);
  if (type === "application/x-www-form-urlencoded") {
    return boundedFormData(new URLSearchParams(new TextDecoder().decode(bytes)), shape);
  }
  let parsed: FormData;
  try {
    parsed = await new Response(bytes, {
      headers: { "Content-Type": request.headers.get("Content-Type")! },
    }).formData();
  } catch {
    throw new BodyRefused(400, "The form's multipart body could not be read. Send the form again.");
  }
  return boundedFormData(parsed, shape);
}

export type FormReadOptions = {
  /** Plain text fields the form sends besides its schemas' keys (hidden intents, versions). */
  fields?: readonly string[];
  /** The body limit; uploads pass their own. */
  maxBytes?: number;
};

const shapes = new WeakMap<object, FormShape>();

function cachedShape(schemas: unknown | readonly unknown[], fields: readonly string[] = []): FormShape {
  const key = (Array.isArray(schemas) ? schemas[0] : schemas) as object | undefined;
  const cacheable = key && (!Array.isArray(schemas) || schemas.length === 1) && fields.length === 0;
  if (cacheable && shapes.has(key)) return shapes.get(key)!;
  const shape = formShape(schemas, fields);
  if (cacheable) shapes.set(key, shape);
  return shape;
}

/**
 * The form an action reads: at most `maxBytes`, only the keys of its schema(s), every list within
 * its schema's maximum. A body that is not a form, too large or past those bounds stops the action
 * with a short 4xx message (415, 413 or 400).
 */
export async function readFormData(
  request: Request,
  schemas: z.ZodType | readonly z.ZodType[],
  options: FormReadOptions = {},
): Promise<FormData> {
  try {
    return await readBoundedForm(request, cachedShape(schemas, options.fields), options.maxBytes);
  } catch (error) {
    if (error instanceof BodyRefused) httpError(error.status, error.message);
    throw error;
  }
}

/** A copy of the request whose body is the bounded form, for code that reads the body itself. */
export function requestWithForm(request: Request, form: FormData): Request {
  const headers = new Headers(request.headers);
  headers.delete("Content-Type");
  headers.delete("Content-Length");
  return new Request(request.url, { method: request.method, headers, body: form });
}

/**
 * Keeps of a parsed value only what the shape allows: unknown keys dropped, lists cut at their
 * maximum, over-long text dropped. Used on stored drafts, so none is heavier than a valid form.
 */
export function pruneToShape(input: unknown, shape: FormShape): unknown {
  if (shape.kind === "value") {
    if (typeof input === "string") return input.length <= shape.maxLength ? input : undefined;
    return typeof input === "number" || typeof input === "boolean" ? input : undefined;
  }
  if (shape.kind === "array") {
    if (!Array.isArray(input)) return shape.element.kind === "value" ? pruneToShape(input, shape.element) : undefined;
    const items: unknown[] = [];
    for (let index = 0; index < Math.min(input.length, shape.max); index++) {
      items.push(pruneToShape(input[index], shape.element) ?? null);
    }
    return items;
  }
  if (!input || typeof input !== "object" || Array.isArray(input)) return undefined;
  const output: Record<string, unknown> = {};
  for (const [key, field] of shape.fields) {
    if (!Object.hasOwn(input, key)) continue;
    const kept = pruneToShape((input as Record<string, unknown>)[key], field);
    if (kept !== undefined) output[key] = kept;
  }
  return output;
}

/** The shape of a schema, for `pruneToShape`. */
export function shapeOfSchemas(schemas: z.ZodType | readonly z.ZodType[], fields: readonly string[] = []): FormShape {
  return cachedShape(schemas, fields);
}

/**
 * A JSON body for `/api/*`: at most `maxBytes`, JSON by its content type (or none), parsed, then
 * bounded by the schema's shape like a form. Refusals are JSON `{ "error": … }` with 400, 413 or 415.
 */
export async function readJsonBody(
  request: Request,
  schema: z.ZodType,
  maxBytes = JSON_BODY_MAX_BYTES,
): Promise<unknown> {
  const type = mediaType(request);
  if (type !== "" && type !== "application/json" && !type.endsWith("+json")) {
    apiError(415, "Send the body as JSON (Content-Type: application/json).");
  }
  let text: string;
  try {
    text = new TextDecoder().decode(await readBodyBytes(request, maxBytes));
  } catch (error) {
    if (error instanceof BodyRefused) apiError(error.status, error.message);
    throw error;
  }
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch {
    apiError(400, "The request body is not valid JSON.");
  }
  try {
    return boundedJson(parsed, cachedShape(schema));
  } catch (error) {
    if (error instanceof BodyRefused) apiError(error.status, error.message);
    throw error;
  }
}

/** Like `pruneToShape`, but a list past its maximum or text past its cap is refused, not cut. */
function boundedJson(input: unknown, shape: FormShape, path = ""): unknown {
  if (shape.kind === "value") {
    if (typeof input === "string" && input.length > shape.maxLength) {
      throw new BodyRefused(400, `${path || "The value"} is longer than ${shape.maxLength} characters.`);
    }
    return input !== null && typeof input === "object" ? undefined : input;
  }
  if (shape.kind === "array") {
    if (!Array.isArray(input)) return input !== null && typeof input === "object" ? undefined : input;
    if (input.length > shape.max) {
      throw new BodyRefused(400, `${path || "The list"} has more than ${shape.max} entries.`);
    }
    return input.map((item, index) => boundedJson(item, shape.element, `${path}.${index}`));
  }
  if (!input || typeof input !== "object" || Array.isArray(input)) return input;
  const output: Record<string, unknown> = {};
  for (const [key, field] of shape.fields) {
    if (!Object.hasOwn(input, key)) continue;
    const kept = boundedJson((input as Record<string, unknown>)[key], field, path ? `${path}.${key}` : key);
    if (kept !== undefined) output[key] = kept;
  }
  return output;
}
