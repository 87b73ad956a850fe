// Outgoing mail through nodemailer: the local catcher in development, any SMTP server otherwise.
// Only the outbox sender (mail/sender.server.ts) calls sendMail; everything else queues mail
// with enqueueMail (mail/outbox.server.ts) so that it is stored with the change it reports.
import nodemailer, { type Transporter } from "nodemailer";
import { config } from "./config.server";
import { plainText } from "./text-hygiene";

let transport: Transporter | undefined;
export function mailer(): Transporter {
  if (!transport) {
    const c = config();
    transport = nodemailer.createTransport({
      host: c.SMTP_HOST,
      port: c.SMTP_PORT,
      secure: c.SMTP_SECURE,
      ignoreTLS: !c.SMTP_SECURE && c.SMTP_HOST === "127.0.0.1",
      auth: c.SMTP_USER ? { user: c.SMTP_USER, pass: c.SMTP_PASSWORD ?? "" } : undefined,
      // an unreachable server must fail a try quickly; the outbox retries it later
      connectionTimeout: 10_000,
      greetingTimeout: 10_000,
      socketTimeout: 30_000,
    });
  }
  return transport;
}

export interface Mail {
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
  /** the same id on every delivery of one outbox row, so a repeated delivery can be dropped */
  messageId?: string;
}

/**
 * Send one mail. The subject is one plain line: names people typed (a model called
 * "invoice\u202Efdp.exe") lose bidi and other control characters here, for every mail.
 */
export async function sendMail(mail: Mail): Promise<void> {
  await mailer().sendMail({ from: config().MAIL_FROM, ...mail, subject: plainText(mail.subject) });
}
