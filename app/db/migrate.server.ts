// Applies the committed drizzle/ migrations; used by `npm start`, the worker and the tests.
import { migrate } from "drizzle-orm/libsql/migrator";
import path from "node:path";
import type { Db } from "./client.server";

export async function migrateDb(db: Db, folder = path.resolve(process.cwd(), "drizzle")) {
  if (db.$client.protocol === "file") await db.$client.execute("PRAGMA journal_mode=WAL");
  await db.$client.execute("PRAGMA foreign_keys=ON");
  await migrate(db, { migrationsFolder: folder });
}
