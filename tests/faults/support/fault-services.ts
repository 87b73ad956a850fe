// The services of a fault test: like tests/support/services.ts (temp folder, free loopback
// ports, the env the app reads), but the S3 fake and the mail catcher each run in a child
// process the test can kill, restart on the same port, or freeze (service-process.ts).
import getPort from "get-port";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { readCaughtMail, type CaughtMail } from "../../../local-services/mail-catcher";
import type { TestServices } from "../../support/services";
import { ServiceProcess } from "./service-process";

export interface FaultServices extends TestServices {
  storage: ServiceProcess;
  smtp: ServiceProcess;
  caught(): CaughtMail[];
}

export async function startFaultServices(): Promise<FaultServices> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "strutwise-fault-"));
  const [s3Port, smtpPort, mailHttpPort] = [await getPort(), await getPort(), await getPort()];
  const bucket = "strutwise-fault";
  const mailDir = path.join(dir, "mail");
  const storage = new ServiceProcess("S3 fake", ["s3", String(s3Port), path.join(dir, "s3"), bucket]);
  const smtp = new ServiceProcess("mail catcher", ["smtp", String(smtpPort), String(mailHttpPort), mailDir]);
  await Promise.all([storage.start(), smtp.start()]);
  const stopBoth = () => Promise.all([storage.kill(), smtp.kill()]).then(() => undefined);
  const env: Record<string, string> = {
    NODE_ENV: "test",
    DATA_DIR: dir,
    DATABASE_URL: `file:${path.join(dir, "test.db")}`,
    S3_ENDPOINT: `http://127.0.0.1:${s3Port}`,
    S3_BUCKET: bucket,
    S3_ACCESS_KEY_ID: "S3RVER",
    S3_SECRET_ACCESS_KEY: "S3RVER",
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(smtpPort),
    MAIL_CATCHER_URL: `http://127.0.0.1:${mailHttpPort}`,
    SIGN_UP: "open",
  };
  const caught = () => readCaughtMail(mailDir);
  return {
    dir,
    env,
    storage,
    smtp,
    caught,
    s3: { url: env.S3_ENDPOINT!, stop: () => storage.kill() },
    mail: {
      smtpPort,
      httpUrl: env.MAIL_CATCHER_URL!,
      messages: caught,
      clear: () => {
        for (const f of fs.readdirSync(mailDir)) if (f.endsWith(".json")) fs.rmSync(path.join(mailDir, f));
      },
      stop: () => smtp.kill(),
    },
    stop: async () => {
      await stopBoth();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}
