// Configuration from the environment, validated once at start-up. A wrong variable stops
// the process with a message naming it, instead of failing later somewhere deep.
import os from "node:os";
import { z } from "zod";

const bool = z
  .enum(["true", "false", "1", "0", "yes", "no"])
  .transform((v) => v === "true" || v === "1" || v === "yes");

const DEV_SECRET = "strutwise-development-secret-not-for-production-use";

const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  PORT: z.coerce.number().int().min(1).max(65535).default(4310),
  APP_URL: z.url().optional(),
  DATABASE_URL: z.string().min(1).default("file:.data/strutwise.db"),
  DATABASE_AUTH_TOKEN: z.string().optional(),
  DATA_DIR: z.string().default(".data"),
  BETTER_AUTH_SECRET: z.string().min(32, "must be at least 32 characters").default(DEV_SECRET),
  S3_ENDPOINT: z.url().optional().default("http://127.0.0.1:4569"),
  S3_REGION: z.string().default("us-east-1"),
  S3_BUCKET: z.string().min(3).default("strutwise"),
  S3_ACCESS_KEY_ID: z.string().default("S3RVER"),
  S3_SECRET_ACCESS_KEY: z.string().default("S3RVER"),
  S3_FORCE_PATH_STYLE: bool.default(true),
  SMTP_HOST: z.string().default("127.0.0.1"),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  SMTP_SECURE: bool.default(false),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().default("Strutwise desk <desk@strutwise.local>"),
  // HTTP port of the local mail catcher's read API (development inbox page); empty = none
  MAIL_CATCHER_URL: z.string().optional().default("http://127.0.0.1:2526"),
  UPLOAD_LIMIT_BYTES: z.coerce.number().int().positive().default(5 * 1024 * 1024),
  WORKER_THREADS: z.coerce.number().int().min(1).max(64).default(Math.max(1, os.availableParallelism())),
  WORKER_MAX_OLD_GENERATION_MB: z.coerce.number().int().min(64).default(1536),
  JOB_TIME_LIMIT_MS: z.coerce.number().int().positive().default(15 * 60_000),
  JOB_LEASE_MS: z.coerce.number().int().min(1000).default(30_000),
  JOB_MAX_ATTEMPTS: z.coerce.number().int().min(1).max(20).default(3),
});

export type Config = z.infer<typeof schema> & { APP_URL: string };

export class ConfigError extends Error {}

export function parseConfig(env: Record<string, string | undefined>): Config {
  const cleaned = Object.fromEntries(Object.entries(env).filter(([, v]) => v !== undefined && v !== ""));
  const parsed = schema.safeParse(cleaned);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new ConfigError(`Invalid configuration:\n${lines.join("\n")}`);
  }
  const c = parsed.data;
  if (c.NODE_ENV === "production" && c.BETTER_AUTH_SECRET === DEV_SECRET && !env.STRUTWISE_ALLOW_DEV_SECRET) {
    throw new ConfigError(
      "Invalid configuration:\n  BETTER_AUTH_SECRET: set a secret of your own in production (the development default is public)",
    );
  }
  return { ...c, APP_URL: c.APP_URL ?? `http://localhost:${c.PORT}` };
}

let cached: Config | undefined;
export function config(): Config {
  cached ??= parseConfig(process.env);
  return cached;
}
