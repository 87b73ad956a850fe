// Counters of the sign-in throttle (rate-limiter-flexible's Drizzle store): one row per
// account or client address, kept in the database so every server process shares them.
import { integer, sqliteTable, text } from "drizzle-orm/sqlite-core";

export const signInThrottle = sqliteTable("sign_in_throttle", {
  key: text("key").primaryKey(), // "account:<e-mail>" or "address:<ip>"
  points: integer("points").notNull(),
  expire: integer("expire", { mode: "timestamp_ms" }),
});
