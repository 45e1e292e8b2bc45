// A local SMTP server on loopback that keeps every message it receives, for the demo and the tests.
// Never for production: it accepts mail from anyone without authentication.
import { createHash, randomUUID } from "node:crypto";
import { mkdirSync, writeFileSync } from "node:fs";
import type { AddressInfo } from "node:net";
import path from "node:path";
import { simpleParser, type AddressObject } from "mailparser";
import { SMTPServer } from "smtp-server";
import { fakeMailDirectory, readFakeMailbox, type StoredMessage } from "../app/lib/fake-mailbox.server";

export type FakeSmtp = {
  port: number;
  directory: string;
  messages: () => Promise<StoredMessage[]>;
  close: () => Promise<void>;
};

const addressText = (value: AddressObject | AddressObject[] | undefined) =>
  (Array.isArray(value) ? value : value ? [value] : []).map((item) => item.text).join(", ");

/** Starts the fake on `port` (0 picks a free one); messages land in `directory` as JSON plus the raw .eml. */
export async function startFakeSmtp(options: { port: number; host?: string; directory?: string }): Promise<FakeSmtp> {
  let directory = options.directory ?? "";
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    logger: false,
    size: 50 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (chunk: Buffer) => chunks.push(chunk));
      stream.on("error", callback);
      stream.on("end", () => {
        const raw = Buffer.concat(chunks);
        simpleParser(raw)
          .then((mail) => {
            const receivedAt = new Date().toISOString();
            const id = `${receivedAt.replace(/[:.]/g, "-")}-${randomUUID().slice(0, 8)}`;
            const stored: StoredMessage = {
              id,
              receivedAt,
              envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
              envelopeTo: session.envelope.rcptTo.map((rcpt) => rcpt.address),
              from: addressText(mail.from),
              to: addressText(mail.to),
              subject: mail.subject ?? "",
              text: mail.text ?? "",
              attachments: mail.attachments.map((attachment) => ({
                filename: attachment.filename ?? "",
                contentType: attachment.contentType,
                size: attachment.size,
                sha256: createHash("sha256").update(attachment.content).digest("hex"),
              })),
            };
            writeFileSync(path.join(directory, `${id}.eml`), raw);
            writeFileSync(path.join(directory, `${id}.json`), JSON.stringify(stored, null, 2));
            callback();
          })
          .catch((error: Error) => callback(error));
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port, options.host ?? "127.0.0.1", () => resolve());
  });
  const port = (server.server.address() as AddressInfo).port;
  directory ||= fakeMailDirectory(port);
  mkdirSync(directory, { recursive: true });
  return {
    port,
    directory,
    messages: () => readFakeMailbox(directory, 1000),
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
