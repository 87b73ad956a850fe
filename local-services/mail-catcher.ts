// Local SMTP mail catcher: accepts every message on loopback, keeps it as JSON under a data
// folder, and serves the messages over a small read-only HTTP API for the development inbox
// page and the tests:  GET /messages (newest first), GET /messages/:id, DELETE /messages.
import { simpleParser } from "mailparser";
import fs from "node:fs";
import http from "node:http";
import path from "node:path";
import { SMTPServer } from "smtp-server";

export interface CaughtMail {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html?: string;
  /** the sender's Message-ID: the outbox gives every delivery of one mail the same one */
  messageId?: string;
}

export interface MailCatcher {
  smtpPort: number;
  httpUrl: string;
  messages(): CaughtMail[];
  clear(): void;
  stop(): Promise<void>;
}

/** Every message caught into `dir`, newest first. */
export function readCaughtMail(dir: string): CaughtMail[] {
  if (!fs.existsSync(dir)) return [];
  return fs
    .readdirSync(dir)
    .filter((f) => f.endsWith(".json"))
    .map((f) => JSON.parse(fs.readFileSync(path.join(dir, f), "utf8")) as CaughtMail)
    .sort((a, b) => (a.receivedAt < b.receivedAt ? 1 : a.receivedAt > b.receivedAt ? -1 : b.id.localeCompare(a.id)));
}

export async function startMailCatcher(opts: { smtpPort: number; httpPort: number; dir: string; host?: string }): Promise<MailCatcher> {
  const host = opts.host ?? "127.0.0.1";
  fs.mkdirSync(opts.dir, { recursive: true });
  let seq = 0;

  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const toField = parsed.to ? (Array.isArray(parsed.to) ? parsed.to : [parsed.to]) : [];
          const to = session.envelope.rcptTo.map((r) => r.address);
          const mail: CaughtMail = {
            id: `${Date.now().toString(36)}-${(seq++).toString(36).padStart(4, "0")}`,
            receivedAt: new Date().toISOString(),
            from: parsed.from?.text ?? session.envelope.mailFrom?.toString() ?? "",
            to: to.length ? to : toField.flatMap((a) => a.value.map((v) => v.address ?? "")),
            subject: parsed.subject ?? "",
            text: parsed.text ?? "",
            html: typeof parsed.html === "string" ? parsed.html : undefined,
            messageId: parsed.messageId,
          };
          // written whole, then renamed: a reader in another process never sees half a message
          const file = path.join(opts.dir, `${mail.id}.json`);
          fs.writeFileSync(`${file}.part`, JSON.stringify(mail));
          fs.renameSync(`${file}.part`, file);
          callback();
        })
        .catch((e: Error) => callback(e));
    },
  });
  await new Promise<void>((resolve, reject) => {
    smtp.once("error", reject);
    smtp.listen(opts.smtpPort, host, () => resolve());
  });

  const api = http.createServer((req, res) => {
    const url = new URL(req.url ?? "/", "http://x");
    const send = (status: number, body: unknown) => {
      res.writeHead(status, { "content-type": "application/json" });
      res.end(JSON.stringify(body));
    };
    if (req.method === "GET" && url.pathname === "/messages") return send(200, { messages: readCaughtMail(opts.dir) });
    const m = url.pathname.match(/^\/messages\/([\w-]+)$/);
    if (req.method === "GET" && m) {
      const file = path.join(opts.dir, `${m[1]}.json`);
      return fs.existsSync(file) ? send(200, JSON.parse(fs.readFileSync(file, "utf8"))) : send(404, { error: "no such message" });
    }
    if (req.method === "DELETE" && url.pathname === "/messages") {
      for (const f of fs.readdirSync(opts.dir)) if (f.endsWith(".json")) fs.rmSync(path.join(opts.dir, f));
      return send(200, { ok: true });
    }
    send(404, { error: "not found" });
  });
  await new Promise<void>((resolve, reject) => {
    api.once("error", reject);
    api.listen(opts.httpPort, host, () => resolve());
  });

  let stopped: Promise<void> | undefined;
  return {
    smtpPort: opts.smtpPort,
    httpUrl: `http://${host}:${opts.httpPort}`,
    messages: () => readCaughtMail(opts.dir),
    clear: () => {
      for (const f of fs.readdirSync(opts.dir)) if (f.endsWith(".json")) fs.rmSync(path.join(opts.dir, f));
    },
    // idempotent, like the S3 fake's
    stop: () =>
      (stopped ??= (async () => {
        api.closeAllConnections();
        await new Promise<void>((r) => api.close(() => r()));
        await new Promise<void>((r) => smtp.close(() => r()));
      })()),
  };
}
