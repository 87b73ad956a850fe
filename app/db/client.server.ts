// One libSQL client and Drizzle handle per process. WAL is persisted in the file; the busy
// timeout is a client option so that every pooled connection gets it (a PRAGMA reaches one).
import { createClient, type Client, type ResultSet } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import type { BaseSQLiteDatabase } from "drizzle-orm/sqlite-core";
import fs from "node:fs";
import path from "node:path";
import { config } from "~/lib/config.server";
import { recoverFromBusy } from "./busy-recovery";
import * as schema from "./schema";

export type Db = LibSQLDatabase<typeof schema> & { $client: Client };
/** The database or a transaction on it: what a write that must share a transaction takes. */
export type DbExecutor = BaseSQLiteDatabase<"async", ResultSet, typeof schema>;

// Changes that must be stored together (a job's end and its mails, a review and its audit
// row) go in one db.batch([...]), never an interactive db.transaction(): the SQLite client
// runs statements synchronously on pooled connections, so a second write in this process
// while a transaction waits on an await would block the whole process until the busy
// timeout, and fail.

export function createDb(url: string, authToken?: string): Db {
  if (url.startsWith("file:")) {
    const file = url.slice("file:".length);
    if (file && file !== ":memory:") fs.mkdirSync(path.dirname(path.resolve(file)), { recursive: true });
  }
  const opened = createClient({ url, authToken, timeout: 5000 });
  // an in-memory database lives in its one connection: dropping it would drop the data
  const client = opened.protocol === "file" && !url.includes(":memory:") ? recoverFromBusy(opened) : opened;
  return drizzle(client, { schema }) as Db;
}

let instance: Db | undefined;
export function db(): Db {
  if (!instance) {
    const c = config();
    instance = createDb(c.DATABASE_URL, c.DATABASE_AUTH_TOKEN);
  }
  return instance;
}
