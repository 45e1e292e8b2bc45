import { readdir, readFile } from "node:fs/promises";
import path from "node:path";

/** What the local fake SMTP server keeps of each message it receives (demo and tests only). */
export type StoredMessage = {
  id: string;
  receivedAt: string;
  envelopeFrom: string;
  envelopeTo: string[];
  from: string;
  to: string;
  subject: string;
  text: string;
  attachments: { filename: string; contentType: string; size: number; sha256: string }[];
};

/** The fake's store for one port, so that fakes of several checkouts or test runs never mix. */
export function fakeMailDirectory(port: number | string): string {
  return path.join(process.env.FAKE_MAIL_DIR || ".data/fake-mail", String(port));
}

export function smtpPort(smtpUrl: string): number {
  const url = new URL(smtpUrl);
  return Number(url.port || (url.protocol === "smtps:" ? 465 : 25));
}

/** Newest first; an absent store reads as empty. */
export async function readFakeMailbox(directory: string, limit = 100): Promise<StoredMessage[]> {
  let names: string[];
  try {
    names = (await readdir(directory)).filter((name) => name.endsWith(".json"));
  } catch {
    return [];
  }
  names.sort().reverse();
  const messages: StoredMessage[] = [];
  for (const name of names.slice(0, limit)) {
    try {
      messages.push(JSON.parse(await readFile(path.join(directory, name), "utf8")) as StoredMessage);
    } catch {
      // A message being written right now is read on the next visit.
    }
  }
  return messages;
}
