// Test environment: a fresh database file, the S3 fake and the mail catcher on free loopback
// ports, and the env variables the app's config reads. Call before the first config() use.
import getPort from "get-port";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { startMailCatcher, type MailCatcher } from "../../local-services/mail-catcher";
import { startS3Fake, type S3Fake } from "../../local-services/s3-fake";

export interface TestServices {
  dir: string;
  env: Record<string, string>;
  mail: MailCatcher;
  s3: S3Fake;
  stop(): Promise<void>;
}

export async function startTestServices(opts: { applyEnv?: boolean } = {}): Promise<TestServices> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "strutwise-test-"));
  const [s3Port, smtpPort, mailHttpPort] = [await getPort(), await getPort(), await getPort()];
  const bucket = "strutwise-test";
  const s3 = await startS3Fake({ port: s3Port, dir: path.join(dir, "s3"), bucket });
  const mail = await startMailCatcher({ smtpPort, httpPort: mailHttpPort, dir: path.join(dir, "mail") });
  const env: Record<string, string> = {
    NODE_ENV: "test",
    DATA_DIR: dir,
    DATABASE_URL: `file:${path.join(dir, "test.db")}`,
    S3_ENDPOINT: s3.url,
    S3_BUCKET: bucket,
    S3_ACCESS_KEY_ID: "S3RVER",
    S3_SECRET_ACCESS_KEY: "S3RVER",
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(smtpPort),
    MAIL_CATCHER_URL: mail.httpUrl,
    // fixtures create accounts through sign-up; the sign-up policy tests set their own mode
    SIGN_UP: "open",
  };
  if (opts.applyEnv !== false) Object.assign(process.env, env);
  return {
    dir,
    env,
    mail,
    s3,
    stop: async () => {
      await mail.stop();
      await s3.stop();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}
