import { HeadBucketCommand } from "@aws-sdk/client-s3";
import { sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { config } from "~/lib/config.server";
import { mailer } from "~/lib/mail.server";
import { s3 } from "~/lib/storage.server";

// Really touches each dependency: a query, a bucket head request, an SMTP handshake.
async function probe(fn: () => Promise<unknown>): Promise<string> {
  try {
    await Promise.race([fn(), new Promise((_, rej) => setTimeout(() => rej(new Error("timed out after 3 s")), 3000))]);
    return "ok";
  } catch (e) {
    return e instanceof Error ? e.message || e.name : String(e);
  }
}

export async function loader() {
  const [dbState, storage, mail] = await Promise.all([
    probe(() => db().run(sql`select 1`)),
    probe(() => s3().send(new HeadBucketCommand({ Bucket: config().S3_BUCKET }))),
    probe(() => mailer().verify()),
  ]);
  const ok = dbState === "ok" && storage === "ok" && mail === "ok";
  return Response.json({ db: dbState, storage, mail }, { status: ok ? 200 : 503, headers: { "Cache-Control": "no-store" } });
}
