// Benchmark of memory while an attachment upload streams in: an oversized body (refused at the
// agency's limit) and one within the limit (written to a temporary file), through the app's own
// multipart reader. Each row is the peak growth of the process's resident memory as a share of the
// body's size: memory stays flat when that share is small, whatever the body's size. No database.
// Not a test.
//   npm run bench -- attachments          (or: node --import tsx scripts/bench-attachments.ts)
import { machine, ratioRow, writeResults, type BenchRow } from "./benchmark-results";

const { receiveUpload } = await import("../app/lib/multipart-upload.server");
const { BodyRefused } = await import("../app/lib/form-data.server");

const MEGABYTE = 1024 * 1024;
const RUNS = 3;
const LIMIT_MB = 25;
const CHUNK = new Uint8Array(256 * 1024).fill(0x41);

/** A multipart request whose file part is `fileBytes` long, produced chunk by chunk as it is read. */
function streamingUpload(fileBytes: number): Request {
  const boundary = "----bench-attachments-boundary";
  const encoder = new TextEncoder();
  const head = encoder.encode(
    `--${boundary}\r\nContent-Disposition: form-data; name="kind"\r\n\r\nphoto\r\n` +
      `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="big.jpg"\r\n` +
      "Content-Type: image/jpeg\r\n\r\n",
  );
  const tail = encoder.encode(`\r\n--${boundary}--\r\n`);
  let sent = 0;
  let stage: "head" | "file" | "tail" | "done" = "head";
  const body = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (stage === "head") {
        controller.enqueue(head);
        stage = "file";
      } else if (stage === "file") {
        const size = Math.min(CHUNK.length, fileBytes - sent);
        controller.enqueue(CHUNK.slice(0, size));
        sent += size;
        if (sent >= fileBytes) stage = "tail";
      } else if (stage === "tail") {
        controller.enqueue(tail);
        stage = "done";
      } else {
        controller.close();
      }
    },
  });
  return new Request("http://127.0.0.1/api/events/1/attachments", {
    method: "POST",
    body,
    headers: { "Content-Type": `multipart/form-data; boundary=${boundary}` },
    duplex: "half",
  } as RequestInit);
}

/** Peak resident-memory growth while `run` goes, sampled every 5 ms. */
async function peakGrowth(run: () => Promise<void>): Promise<number> {
  const start = process.memoryUsage().rss;
  let peak = start;
  const timer = setInterval(() => {
    peak = Math.max(peak, process.memoryUsage().rss);
  }, 5);
  try {
    await run();
  } finally {
    clearInterval(timer);
  }
  return Math.max(peak, process.memoryUsage().rss) - start;
}

async function oversized(bodyBytes: number) {
  try {
    await receiveUpload(streamingUpload(bodyBytes), {
      fileField: "file",
      maxFileBytes: LIMIT_MB * MEGABYTE,
      limitLabel: `${LIMIT_MB} MB`,
      fields: ["kind"],
    });
    throw new Error("the oversized upload was not refused");
  } catch (error) {
    if (!(error instanceof BodyRefused) || error.status !== 413) throw error;
  }
}

async function accepted(bodyBytes: number) {
  const upload = await receiveUpload(streamingUpload(bodyBytes), {
    fileField: "file",
    maxFileBytes: LIMIT_MB * MEGABYTE,
    limitLabel: `${LIMIT_MB} MB`,
    fields: ["kind"],
  });
  if (upload.file.byteSize !== bodyBytes) throw new Error(`received ${upload.file.byteSize} of ${bodyBytes} bytes`);
  await upload.discard();
}

async function main() {
  const machineAtStart = machine();
  const rows: BenchRow[] = [];
  const cases = [
    { name: `attachment upload of 200 MB refused at the ${LIMIT_MB} MB limit`, bytes: 200 * MEGABYTE, run: oversized },
    { name: `attachment upload of 20 MB within the ${LIMIT_MB} MB limit`, bytes: 20 * MEGABYTE, run: accepted },
  ];
  for (const entry of cases) {
    const shares: number[] = [];
    for (let index = 0; index < RUNS; index++) {
      const growth = await peakGrowth(() => entry.run(entry.bytes));
      shares.push(Math.max(growth, 0) / entry.bytes);
    }
    const row = ratioRow(entry.name, shares, "the body's size in bytes (peak memory growth ÷ body size)", 0.25);
    console.log(`${entry.name}: peak memory growth ${(row.median * 100).toFixed(1)} % of the body (goal ≤ 25 %)`);
    rows.push(row);
  }
  writeResults(rows, machineAtStart);
}

await main();
