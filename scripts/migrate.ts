// `npm run db:migrate`: applies the committed drizzle/ migrations to the configured database
// (`npm start`, the seed and the e2e harness do this by themselves).
import { db } from "~/db/client.server";
import { migrateDb } from "~/db/migrate.server";
import { ConfigError, config } from "~/lib/config.server";

try {
  const c = config();
  await migrateDb(db());
  db().$client.close();
  console.log(`Migrations applied to ${c.DATABASE_URL}`);
} catch (e) {
  console.error(e instanceof ConfigError ? e.message : `Migration failed: ${e instanceof Error ? e.message : String(e)}`);
  process.exit(1);
}
