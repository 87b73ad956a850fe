// Outgoing mail through nodemailer: the local catcher in development, any SMTP server otherwise.
import nodemailer, { type Transporter } from "nodemailer";
import { config } from "./config.server";

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
    });
  }
  return transport;
}

export interface Mail {
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
}

export async function sendMail(mail: Mail): Promise<void> {
  await mailer().sendMail({ from: config().MAIL_FROM, ...mail });
}
