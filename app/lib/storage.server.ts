import {
  CreateBucketCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
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

/** Best effort: a leftover object is harmless, a failed clean-up must not hide the first error. */
export async function deleteObjectQuietly(key: string): Promise<void> {
  try {
    await client().send(new DeleteObjectCommand({ Bucket: bucket(), Key: key }));
  } catch {
    // nothing to do
  }
}
