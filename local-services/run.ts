// The local stand-ins for hosted services: the S3 fake and the SMTP mail catcher, on loopback,
// keeping their data under DATA_DIR (default .data/, git-ignored). `npm start` runs them
// in-process; `npm run services` runs them alone (e.g. beside `npm run worker` on its own).
//   S3_PORT (4569), SMTP_PORT (2525), MAIL_HTTP_PORT (2526), S3_BUCKET, DATA_DIR
import path from "node:path";
import { pathToFileURL } from "node:url";
import type { Config } from "~/lib/config.server";
import { startMailCatcher, type MailCatcher } from "./mail-catcher";
import { startS3Fake, type S3Fake } from "./s3-fake";

export interface LocalServices {
  s3: S3Fake;
  mail: MailCatcher;
  stop(): Promise<void>;
}

function explainListenError(what: string, variable: string, port: number, e: unknown): Error {
  const code = (e as { code?: string }).code;
  if (code === "EADDRINUSE") return new Error(`${what}: port ${port} is already in use; choose another with ${variable}`);
  return new Error(`${what} could not start on port ${port}: ${e instanceof Error ? e.message : String(e)}`);
}

export async function startLocalServices(c: Config): Promise<LocalServices> {
  const s3 = await startS3Fake({ port: c.S3_PORT, dir: path.join(c.DATA_DIR, "s3"), bucket: c.S3_BUCKET }).catch((e) => {
    throw explainListenError("The S3 fake", "S3_PORT", c.S3_PORT, e);
  });
  let mail: MailCatcher;
  try {
    mail = await startMailCatcher({ smtpPort: c.SMTP_PORT, httpPort: c.MAIL_HTTP_PORT, dir: path.join(c.DATA_DIR, "mail") });
  } catch (e) {
    await s3.stop();
    const httpSide = (e as { port?: number }).port === c.MAIL_HTTP_PORT;
    throw httpSide
      ? explainListenError("The mail catcher's read API", "MAIL_HTTP_PORT", c.MAIL_HTTP_PORT, e)
      : explainListenError("The mail catcher", "SMTP_PORT", c.SMTP_PORT, e);
  }
  return {
    s3,
    mail,
    stop: async () => {
      await mail.stop();
      await s3.stop();
    },
  };
}

/** Lines saying where the services listen, for the console. */
export function describeLocalServices(svc: LocalServices, c: Config): string[] {
  return [
    `S3 fake        ${svc.s3.url}  bucket "${c.S3_BUCKET}", data in ${path.join(c.DATA_DIR, "s3")}`,
    `mail catcher   smtp://127.0.0.1:${svc.mail.smtpPort}  caught mail at ${svc.mail.httpUrl}/messages`,
  ];
}

async function main() {
  const { config, ConfigError } = await import("~/lib/config.server");
  let c: Config;
  try {
    c = config();
  } catch (e) {
    console.error(e instanceof ConfigError ? e.message : String(e));
    process.exit(1);
  }
  let svc: LocalServices;
  try {
    svc = await startLocalServices(c);
  } catch (e) {
    console.error(e instanceof Error ? e.message : String(e));
    process.exit(1);
  }
  for (const line of describeLocalServices(svc, c)) console.log(line);
  console.log("Ctrl-C stops them.");
  let stopping = false;
  const stop = async () => {
    if (stopping) return;
    stopping = true;
    await svc.stop();
    process.exit(0);
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) void main();
