// Section catalogues kept by the desk (shared by everyone signed in; written by admins and
// engineers). A catalogue is stored whole, sections as one JSON list, so an upload is one
// insert: it is there complete or not at all. Retiring keeps the row (models copied their
// sections, and the record of what was offered stays); it only leaves the pick lists.
import { sql } from "drizzle-orm";
import { index, integer, sqliteTable, text } from "drizzle-orm/sqlite-core";
import { user } from "../auth-schema";

export const sectionCatalogues = sqliteTable(
  "section_catalogues",
  {
    id: text("id").primaryKey(),
    name: text("name").notNull(),
    description: text("description"),
    fileName: text("file_name").notNull(),
    sha256: text("sha256").notNull(), // of the uploaded CSV, as sent
    sectionCount: integer("section_count").notNull(),
    families: text("families", { mode: "json" }).notNull(), // string[], in file order
    dimensionNames: text("dimension_names", { mode: "json" }).notNull(), // string[]
    sections: text("sections", { mode: "json" }).notNull(), // CatalogueSection[] in mm, mm², mm⁴, kg/m
    createdBy: text("created_by").references(() => user.id),
    createdAt: integer("created_at", { mode: "timestamp_ms" })
      .notNull()
      .default(sql`(cast(unixepoch('subsecond') * 1000 as integer))`),
    retiredAt: integer("retired_at", { mode: "timestamp_ms" }),
    retiredBy: text("retired_by").references(() => user.id),
    retireReason: text("retire_reason"),
  },
  (t) => [index("section_catalogues_created_idx").on(t.createdAt)],
);
