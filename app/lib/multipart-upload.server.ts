import { randomUUID } from "node:crypto";
import { createWriteStream } from "node:fs";
import { mkdir, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import busboy from "busboy";
import { BodyRefused } from "./form-data.server";

/**
 * A multipart upload read as a stream with busboy: the one file goes straight to a temporary file
 * while its bytes are counted, so a large upload never sits whole in memory, and a file past the
 * limit stops the reading at the limit. Plain fields are kept only when named and short.
 */

/** The multipart framing and small fields an upload carries besides its file. */
export const UPLOAD_FRAMING_BYTES = 64 * 1024;

export type ReceivedFile = {
  /** The temporary file; removed by `discard`. */
  path: string;
  /** The name the sender gave, for showing only: it never names a stored object. */
  name: string;
  byteSize: number;
};

export type ReceivedUpload = {
  file: ReceivedFile;
  fields: Record<string, string>;
  discard: () => Promise<void>;
};

export type UploadLimits = {
  /** The field that carries the file. */
  fileField: string;
  maxFileBytes: number;
  /** What to say of the limit, e.g. "25 MB". */
  limitLabel: string;
  /** The plain fields kept, each at most 200 characters. */
  fields: readonly string[];
};

const FIELD_MAX_CHARACTERS = 200;

function mediaType(request: Request): string {
  return (request.headers.get("Content-Type") ?? "").split(";")[0].trim().toLowerCase();
}

/**
 * Refuses a body whose declared length already passes the limit, before a byte is read (413 with
 * the limit), and one that is not multipart (415).
 */
export function refuseEarly(request: Request, limits: Pick<UploadLimits, "maxFileBytes" | "limitLabel">): void {
  if (mediaType(request) !== "multipart/form-data") {
    throw new BodyRefused(415, "Send the file as multipart/form-data.");
  }
  const declared = Number(request.headers.get("Content-Length") ?? "");
  if (Number.isFinite(declared) && declared > limits.maxFileBytes + UPLOAD_FRAMING_BYTES) {
    throw new BodyRefused(413, `The file is larger than ${limits.limitLabel}, the most the agency settings allow.`);
  }
}

/** Reads one file and the named fields; throws `BodyRefused` (400, 413, 415) and leaves nothing behind. */
export async function receiveUpload(request: Request, limits: UploadLimits): Promise<ReceivedUpload> {
  refuseEarly(request, limits);
  if (!request.body) throw new BodyRefused(400, `Send a file in the field “${limits.fileField}”.`);
  const directory = path.join(tmpdir(), "foamtally-uploads");
  await mkdir(directory, { recursive: true });
  const filePath = path.join(directory, randomUUID());
  const discard = () => rm(filePath, { force: true });

  const headers = Object.fromEntries(request.headers);
  let parser: busboy.Busboy;
  try {
    parser = busboy({
      headers,
      limits: {
        files: 1,
        fileSize: limits.maxFileBytes,
        fields: limits.fields.length + 4,
        fieldSize: FIELD_MAX_CHARACTERS * 4,
        parts: limits.fields.length + 5,
      },
    });
  } catch {
    throw new BodyRefused(400, "The upload's multipart body could not be read. Send it again.");
  }
  const source = Readable.fromWeb(request.body as import("node:stream/web").ReadableStream<Uint8Array>);
  const fields: Record<string, string> = {};

  const received = new Promise<ReceivedFile>((resolve, reject) => {
    let file: ReceivedFile | null = null;
    let writing: Promise<void> | null = null;
    let refused: BodyRefused | null = null;
    const refuse = (status: 400 | 413, message: string) => {
      refused ??= new BodyRefused(status, message);
      source.unpipe(parser);
      source.destroy();
      reject(refused);
    };
    parser.on("field", (name, value, info) => {
      if (!limits.fields.includes(name)) return;
      if (info.valueTruncated || value.length > FIELD_MAX_CHARACTERS) {
        refuse(400, `The field ${name} is longer than ${FIELD_MAX_CHARACTERS} characters.`);
        return;
      }
      fields[name] = value;
    });
    parser.on("file", (name, stream, info) => {
      if (name !== limits.fileField || file) {
        stream.resume();
        return;
      }
      const entry: ReceivedFile = { path: filePath, name: info.filename ?? "", byteSize: 0 };
      file = entry;
      stream.on("data", (chunk: Buffer) => {
        entry.byteSize += chunk.length;
      });
      stream.on("limit", () =>
        refuse(413, `The file is larger than ${limits.limitLabel}, the most the agency settings allow.`),
      );
      writing = pipeline(stream, createWriteStream(filePath));
      writing.catch(() => refuse(400, "The upload stopped before the file was complete. Send it again."));
    });
    parser.on("filesLimit", () => refuse(413, "Send one file per request."));
    parser.on("partsLimit", () => refuse(413, "The upload has more parts than a file and its kind."));
    parser.on("fieldsLimit", () => refuse(413, "The upload has more fields than a file and its kind."));
    parser.on("error", () => refuse(400, "The upload's multipart body could not be read. Send it again."));
    parser.on("close", () => {
      if (refused) return;
      if (!file || !writing) {
        reject(new BodyRefused(400, `Send a file in the field “${limits.fileField}”.`));
        return;
      }
      const done = file;
      writing.then(() => (refused ? undefined : resolve(done)), reject);
    });
    source.on("error", () => refuse(400, "The upload stopped before the file was complete. Send it again."));
  });
  source.pipe(parser);
  try {
    const file = await received;
    if (file.byteSize === 0) throw new BodyRefused(400, "The file is empty.");
    return { file, fields, discard };
  } catch (error) {
    await discard();
    throw error;
  }
}
