import S3rver from "s3rver";
import { env } from "~/lib/env.server";

/** A local S3 fake on a free port for one test file; the storage module is pointed at it. */
export async function startFileStore(name: string): Promise<() => Promise<void>> {
  const s3 = new S3rver({
    address: "127.0.0.1",
    port: 0,
    silent: true,
    resetOnClose: true,
    directory: `/tmp/s3-${name}-${process.pid}`,
  });
  const { port } = await s3.run();
  // The cached configuration is the one the storage module reads.
  env().S3_ENDPOINT = `http://127.0.0.1:${port}`;
  return () => s3.close();
}
