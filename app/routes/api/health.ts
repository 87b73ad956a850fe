import { HeadBucketCommand } from "@aws-sdk/client-s3";
import { sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { config } from "~/lib/config.server";
import { mailer } from "~/lib/mail.server";
import { s3 } from "~/lib/storage.server";

// GET /api/health (no auth): really touches each dependency — a query, a bucket head request,
// an SMTP handshake — and says in words which one is at fault. 200 only when all are "ok".

const TIMEOUT_MS = 3000;

function describe(e: unknown): string {
  if (!(e instanceof Error)) return String(e);
  const status = (e as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
  if (status === 404 || e.name === "NotFound" || e.name === "NoSuchBucket") return "the bucket does not exist";
  if (status === 403 || e.name === "Forbidden" || e.name === "AccessDenied") return "access denied (check the S3 credentials)";
  const cause = (e as { cause?: { message?: string; code?: string } }).cause;
  return e.message || cause?.message || cause?.code || e.name || "unknown error";
}

async function probe(what: string, fn: () => Promise<unknown>): Promise<string> {
  let timer: NodeJS.Timeout | undefined;
  try {
    await Promise.race([
      fn(),
      new Promise((_, reject) => {
        timer = setTimeout(() => reject(new Error(`no answer within ${TIMEOUT_MS / 1000} s`)), TIMEOUT_MS);
      }),
    ]);
    return "ok";
  } catch (e) {
    return `${what}: ${describe(e)}`;
  } finally {
    clearTimeout(timer);
  }
}

/** The database location without any credentials a URL might carry. */
function safeDbLocation(url: string): string {
  return url.replace(/\?.*$/, "").replace(/\/\/[^@/]*@/, "//");
}

export async function loader() {
  let c;
  try {
    c = config();
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    return Response.json({ db: message, storage: message, mail: message }, { status: 503, headers: { "Cache-Control": "no-store" } });
  }
  const [dbState, storage, mail] = await Promise.all([
    probe(`database ${safeDbLocation(c.DATABASE_URL)}`, () => db().run(sql`select 1`)),
    probe(`bucket "${c.S3_BUCKET}" at ${c.S3_ENDPOINT}`, () => s3().send(new HeadBucketCommand({ Bucket: c.S3_BUCKET }))),
    probe(`SMTP server ${c.SMTP_HOST}:${c.SMTP_PORT}`, () => mailer().verify()),
  ]);
  const ok = dbState === "ok" && storage === "ok" && mail === "ok";
  return Response.json({ db: dbState, storage, mail }, { status: ok ? 200 : 503, headers: { "Cache-Control": "no-store" } });
}
