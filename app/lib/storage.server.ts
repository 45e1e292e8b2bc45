import { createReadStream } from "node:fs";
import {
  CreateBucketCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
} from "@aws-sdk/client-s3";
import { env } from "./env.server";

/** Object storage (S3-compatible; a local s3rver fake in the demo and the tests) for stored files. */
export class StorageUnavailableError extends Error {
  constructor(cause: unknown) {
    super("The file store is not answering right now.", { cause });
  }
}

const clients = new Map<string, S3Client>();

function client(): S3Client {
  const config = env();
  const endpoint = config.S3_ENDPOINT ?? "";
  let found = clients.get(endpoint);
  if (!found) {
    found = new S3Client({
      endpoint: config.S3_ENDPOINT,
      region: config.S3_REGION,
      forcePathStyle: true,
      credentials: { accessKeyId: config.S3_ACCESS_KEY_ID, secretAccessKey: config.S3_SECRET_ACCESS_KEY },
      // Without these, the SDK frames streamed uploads in aws-chunked encoding that s3rver stores verbatim.
      requestChecksumCalculation: "WHEN_REQUIRED",
      responseChecksumValidation: "WHEN_REQUIRED",
      maxAttempts: 2,
    });
    clients.set(endpoint, found);
  }
  return found;
}

function bucket(): string {
  return env().S3_BUCKET;
}

const ensuredBuckets = new Set<string>();

async function ensureBucket(): Promise<void> {
  const key = `${env().S3_ENDPOINT}/${bucket()}`;
  if (ensuredBuckets.has(key)) return;
  try {
    await client().send(new HeadBucketCommand({ Bucket: bucket() }));
  } catch {
    await client().send(new CreateBucketCommand({ Bucket: bucket() }));
  }
  ensuredBuckets.add(key);
}

async function guarded<T>(run: () => Promise<T>): Promise<T> {
  try {
    return await run();
  } catch (error) {
    throw new StorageUnavailableError(error);
  }
}

export async function putObject(key: string, body: Uint8Array, contentType: string): Promise<void> {
  await guarded(async () => {
    await ensureBucket();
    await client().send(
      new PutObjectCommand({
        Bucket: bucket(),
        Key: key,
        Body: body,
        ContentType: contentType,
        ContentLength: body.byteLength,
      }),
    );
  });
}

export async function getObject(key: string): Promise<{ body: Uint8Array; contentType: string }> {
  return guarded(async () => {
    const response = await client().send(new GetObjectCommand({ Bucket: bucket(), Key: key }));
    const body = await response.Body!.transformToByteArray();
    return { body, contentType: response.ContentType ?? "application/octet-stream" };
  });
}

/** Stores a file from disk, streamed: an upload is never held whole in memory. */
export async function putObjectFile(key: string, filePath: string, byteSize: number, contentType: string) {
  await guarded(async () => {
    await ensureBucket();
    await client().send(
      new PutObjectCommand({
        Bucket: bucket(),
        Key: key,
        Body: createReadStream(filePath),
        ContentType: contentType,
        ContentLength: byteSize,
      }),
    );
  });
}

/** An object as a stream for a response, with its stored length. */
export async function getObjectStream(
  key: string,
): Promise<{ body: ReadableStream<Uint8Array>; contentType: string; byteSize: number | null }> {
  return guarded(async () => {
    const response = await client().send(new GetObjectCommand({ Bucket: bucket(), Key: key }));
    return {
      body: response.Body!.transformToWebStream() as ReadableStream<Uint8Array>,
      contentType: response.ContentType ?? "application/octet-stream",
      byteSize: response.ContentLength ?? null,
    };
  });
}

/** Whether an object is stored under the key (false for a missing one; throws when the store is down). */
export async function objectExists(key: string): Promise<boolean> {
  try {
    await client().send(new HeadObjectCommand({ Bucket: bucket(), Key: key }));
    return true;
  } catch (error) {
    const status = (error as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
    if (status === 404) return false;
    throw new StorageUnavailableError(error);
  }
}

/** Every object under a prefix with when it was stored, page by page. */
export async function* listObjects(prefix: string): AsyncGenerator<{ key: string; storedAt: Date | null }> {
  let token: string | undefined;
  do {
    const page = await guarded(() =>
      client().send(new ListObjectsV2Command({ Bucket: bucket(), Prefix: prefix, ContinuationToken: token })),
    );
    for (const item of page.Contents ?? []) {
      if (item.Key) yield { key: item.Key, storedAt: item.LastModified ?? null };
    }
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);
}

/** Deletes an object; throws when the store is down, so the caller keeps its record of it. */
export async function deleteObject(key: string): Promise<void> {
  await guarded(() => client().send(new DeleteObjectCommand({ Bucket: bucket(), Key: key })));
}

/** Best effort: a leftover object is harmless, a failed clean-up must not hide the first error. */
export async function deleteObjectQuietly(key: string): Promise<void> {
  try {
    await client().send(new DeleteObjectCommand({ Bucket: bucket(), Key: key }));
  } catch {
    // nothing to do
  }
}
