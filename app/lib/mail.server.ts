import nodemailer, { type Transporter } from "nodemailer";
import { env } from "./env.server";

export type OutgoingMail = {
  to: string[];
  subject: string;
  text: string;
  attachments?: { filename: string; contentType: string; content: Buffer }[];
};

const transports = new Map<string, Transporter>();

/**
 * One pooled SMTP transport per URL. Plain smtp:// URLs to loopback (the local fake) skip TLS; other
 * smtp:// servers upgrade with STARTTLS when offered, and smtps:// is TLS from the start.
 */
function transportFor(smtpUrl: string): Transporter {
  let transport = transports.get(smtpUrl);
  if (!transport) {
    const url = new URL(smtpUrl);
    const loopback = ["127.0.0.1", "localhost", "[::1]"].includes(url.hostname);
    transport = nodemailer.createTransport({
      host: url.hostname.replace(/^\[|\]$/g, ""),
      port: Number(url.port || (url.protocol === "smtps:" ? 465 : 25)),
      secure: url.protocol === "smtps:",
      ignoreTLS: loopback && url.protocol === "smtp:",
      auth: url.username
        ? { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) }
        : undefined,
      connectionTimeout: 10_000,
      greetingTimeout: 10_000,
      socketTimeout: 30_000,
    });
    transports.set(smtpUrl, transport);
  }
  return transport;
}

/** Sends one message now; throws what the mail server said when it refuses or cannot be reached. */
export async function sendMail(mail: OutgoingMail, smtpUrl = env().SMTP_URL): Promise<{ messageId: string }> {
  const info = await transportFor(smtpUrl).sendMail({
    from: env().MAIL_FROM,
    to: mail.to,
    subject: mail.subject,
    text: mail.text,
    attachments: mail.attachments,
  });
  return { messageId: String(info.messageId ?? "") };
}
