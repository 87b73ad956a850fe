// One libSQL client and Drizzle handle per process. WAL is persisted in the file; the busy
// timeout is a client option so that every pooled connection gets it (a PRAGMA reaches one).
import { createClient, type Client } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import fs from "node:fs";
import path from "node:path";
import { config } from "~/lib/config.server";
import * as schema from "./schema";

export type Db = LibSQLDatabase<typeof schema> & { $client: Client };

export function createDb(url: string, authToken?: string): Db {
  if (url.startsWith("file:")) {
    const file = url.slice("file:".length);
    if (file && file !== ":memory:") fs.mkdirSync(path.dirname(path.resolve(file)), { recursive: true });
  }
  const client = createClient({ url, authToken, timeout: 5000 });
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
