// Starts the local fakes of hosted services on loopback. Each fake registers itself here.
import { existsSync, mkdirSync } from "node:fs";
import S3rver from "s3rver";
import { startFakeSmtp } from "./fake-smtp";

if (existsSync(".env")) process.loadEnvFile(".env");

// S3-compatible object storage (safety sheets, attachments, submitted quarters) on the port of S3_ENDPOINT.
const s3Endpoint = new URL(process.env.S3_ENDPOINT || "http://localhost:4569");
const s3Directory = `.data/s3-${process.env.FAKES_TAG ?? "demo"}`;
mkdirSync(s3Directory, { recursive: true });
await new S3rver({
  address: s3Endpoint.hostname === "localhost" ? "127.0.0.1" : s3Endpoint.hostname,
  port: Number(s3Endpoint.port || 80),
  silent: true,
  directory: s3Directory,
  configureBuckets: [{ name: process.env.S3_BUCKET || "foamtally", configs: [] }],
}).run();

// SMTP on loopback that keeps every message under .data/fake-mail/<port>/ for the outbox page.
const smtp = await startFakeSmtp({ port: Number(process.env.FAKE_SMTP_PORT || 2525) });
console.log(`fake SMTP on 127.0.0.1:${smtp.port}, messages in ${smtp.directory}`);

console.log("fakes ready");
setInterval(() => {}, 1 << 30);
