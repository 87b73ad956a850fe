// What each person chose for how pages show results: the display unit system (format.ts,
// DISPLAY_UNIT_CHOICES). Conversion happens on display only; stored results and CSVs keep the
// model's units. A person without a row reads each model in its own units.
import { sql } from "drizzle-orm";
import { integer, sqliteTable, text } from "drizzle-orm/sqlite-core";
import { user } from "../auth-schema";

export const userPreferences = sqliteTable("user_preferences", {
  userId: text("user_id")
    .primaryKey()
    .references(() => user.id, { onDelete: "cascade" }),
  displayUnits: text("display_units").notNull().default("model"),
  updatedAt: integer("updated_at", { mode: "timestamp_ms" })
    .notNull()
    .default(sql`(cast(unixepoch('subsecond') * 1000 as integer))`),
});
