// Configuration from the environment, validated once at start-up. A wrong variable stops
// the process with a message naming it, instead of failing later somewhere deep.
import os from "node:os";
import path from "node:path";
import { z } from "zod";

const bool = z
  .enum(["true", "false", "1", "0", "yes", "no"])
  .transform((v) => v === "true" || v === "1" || v === "yes");

const PORT_MSG = "must be a whole number from 1 to 65535";
const port = () => z.coerce.number({ error: PORT_MSG }).int(PORT_MSG).min(1, PORT_MSG).max(65535, PORT_MSG);

const DEV_SECRET = "strutwise-development-secret-not-for-production-use";

const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  PORT: port().default(4310),
  APP_URL: z.url().optional(),
  // file:<path> (default: <DATA_DIR>/strutwise.db), or libsql:// / https:// for a libSQL server
  DATABASE_URL: z
    .string()
    .regex(/^(file:|libsql:\/\/|https?:\/\/|wss?:\/\/)/, "must start with file:, libsql://, http(s):// or ws(s)://")
    .optional(),
  DATABASE_AUTH_TOKEN: z.string().optional(),
  DATA_DIR: z.string().default(".data"),
  // `npm start` runs the S3 fake and the mail catcher itself unless this is off (real S3/SMTP)
  LOCAL_SERVICES: z.enum(["on", "off"]).default("on"),
  // demo accounts and projects on start: default on with the local services, off without
  SEED_DEMO: z.enum(["on", "off"]).optional(),
  S3_PORT: port().default(4569),
  MAIL_HTTP_PORT: port().default(2526),
  BETTER_AUTH_SECRET: z.string().min(32, "must be at least 32 characters").default(DEV_SECRET),
  // unset: the local S3 fake at http://127.0.0.1:<S3_PORT>; for AWS S3 itself, the regional endpoint
  S3_ENDPOINT: z.url().optional(),
  S3_REGION: z.string().default("us-east-1"),
  S3_BUCKET: z.string().min(3).default("strutwise"),
  S3_ACCESS_KEY_ID: z.string().default("S3RVER"),
  S3_SECRET_ACCESS_KEY: z.string().default("S3RVER"),
  S3_FORCE_PATH_STYLE: bool.default(true),
  SMTP_HOST: z.string().default("127.0.0.1"),
  SMTP_PORT: port().default(2525),
  SMTP_SECURE: bool.default(false),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().default("Strutwise desk <desk@strutwise.local>"),
  // read API of the local mail catcher (development inbox); unset with LOCAL_SERVICES=on:
  // http://127.0.0.1:<MAIL_HTTP_PORT>; with LOCAL_SERVICES=off: none
  MAIL_CATCHER_URL: z.url().optional(),
  UPLOAD_LIMIT_BYTES: z.coerce.number().int().positive().default(5 * 1024 * 1024),
  WORKER_THREADS: z.coerce.number().int().min(1).max(64).default(Math.max(1, os.availableParallelism())),
  WORKER_MAX_OLD_GENERATION_MB: z.coerce.number().int().min(64).default(1536),
  JOB_TIME_LIMIT_MS: z.coerce.number().int().positive().default(15 * 60_000),
  JOB_LEASE_MS: z.coerce.number().int().min(1000).default(30_000),
  JOB_MAX_ATTEMPTS: z.coerce.number().int().min(1).max(20).default(3),
  // how long an outbox sender holds a mail it claimed before another sender may deliver it
  // (longer than one SMTP delivery may take: connection, greeting and socket timeouts)
  MAIL_CLAIM_MS: z.coerce.number().int().min(1000).default(120_000),
  // the web process's threads for heavy requests (report drawing, checks of large uploads):
  // how many, how long one request may wait and run there, how many may wait at once
  WEB_THREADS: z.coerce.number().int().min(1).max(16).default(1),
  WEB_TASK_TIMEOUT_MS: z.coerce.number().int().min(100).default(120_000),
  WEB_TASK_QUEUE: z.coerce.number().int().min(1).max(1000).default(16),
  // who may create an account: only invited addresses (default), addresses of these domains
  // (and invited ones), or anyone; every new account still proves its address by a link
  SIGN_UP: z
    .string()
    .trim()
    .toLowerCase()
    .regex(
      /^(invite-only|open|domain:[a-z0-9-]+(\.[a-z0-9-]+)+(,[a-z0-9-]+(\.[a-z0-9-]+)+)*)$/,
      "must be invite-only, open, or domain:<list> (e.g. domain:tarrowkeel.example,keel-site.example)",
    )
    .default("invite-only"),
  INVITATION_TTL_DAYS: z.coerce.number().min(1 / 24, "must be at least 1 hour (1/24)").max(90).default(7),
});

export type Config = z.infer<typeof schema> & {
  APP_URL: string;
  DATABASE_URL: string;
  S3_ENDPOINT: string;
  SEED_DEMO: "on" | "off";
};

export class ConfigError extends Error {}

export type SignUpMode = { kind: "invite-only" } | { kind: "open" } | { kind: "domain"; domains: string[] };

/** SIGN_UP as a value (its text was checked at start-up). */
export function signUpMode(c: Pick<Config, "SIGN_UP"> = config()): SignUpMode {
  if (c.SIGN_UP === "open") return { kind: "open" };
  if (c.SIGN_UP.startsWith("domain:")) return { kind: "domain", domains: c.SIGN_UP.slice("domain:".length).split(",") };
  return { kind: "invite-only" };
}

export function parseConfig(env: Record<string, string | undefined>): Config {
  const cleaned = Object.fromEntries(Object.entries(env).filter(([, v]) => v !== undefined && v !== ""));
  const parsed = schema.safeParse(cleaned);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => {
      const name = i.path.join(".");
      // show the offending value, except for variables that hold secrets
      const shown = /SECRET|PASSWORD|TOKEN|KEY/.test(name) ? "" : ` (got "${cleaned[name]}")`;
      return `  ${name}${shown}: ${i.message}`;
    });
    throw new ConfigError(`Invalid configuration:\n${lines.join("\n")}`);
  }
  const c = parsed.data;
  if (c.NODE_ENV === "production" && c.BETTER_AUTH_SECRET === DEV_SECRET && !env.STRUTWISE_ALLOW_DEV_SECRET) {
    throw new ConfigError(
      "Invalid configuration:\n  BETTER_AUTH_SECRET: set a secret of your own in production (the development default is public)",
    );
  }
  const local = c.LOCAL_SERVICES === "on";
  return {
    ...c,
    APP_URL: c.APP_URL ?? `http://localhost:${c.PORT}`,
    DATABASE_URL: c.DATABASE_URL ?? `file:${path.join(c.DATA_DIR, "strutwise.db")}`,
    S3_ENDPOINT: c.S3_ENDPOINT ?? `http://127.0.0.1:${c.S3_PORT}`,
    MAIL_CATCHER_URL: c.MAIL_CATCHER_URL ?? (local ? `http://127.0.0.1:${c.MAIL_HTTP_PORT}` : undefined),
    SEED_DEMO: c.SEED_DEMO ?? (local ? "on" : "off"),
  };
}

let cached: Config | undefined;
export function config(): Config {
  cached ??= parseConfig(process.env);
  return cached;
}
