// Immutable numbered versions of a model. Version 1 is the first upload (the data migration
// gave every model stored before versions existed its version 1, pointing at its original
// file). The `models` row carries a copy of the latest version's facts, so lists and the
// queue read one row; a version row is never updated or deleted.
import { sql } from "drizzle-orm";
import { index, integer, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { user } from "../auth-schema";
import { models } from "../schema";

export const modelVersions = sqliteTable(
  "model_versions",
  {
    id: text("id").primaryKey(),
    modelId: text("model_id").notNull().references(() => models.id),
    version: integer("version").notNull(),
    name: text("name").notNull(),
    fileName: text("file_name").notNull(),
    fileKey: text("file_key").notNull(), // object key in the bucket
    sha256: text("sha256").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    dimension: integer("dimension").notNull(),
    nodeCount: integer("node_count").notNull(),
    memberCount: integer("member_count").notNull(),
    hasDesign: integer("has_design", { mode: "boolean" }).notNull(),
    summary: text("summary", { mode: "json" }).notNull(),
    warnings: text("warnings", { mode: "json" }).notNull(),
    note: text("note"),
    createdBy: text("created_by").references(() => user.id),
    createdAt: integer("created_at", { mode: "timestamp_ms" })
      .notNull()
      .default(sql`(cast(unixepoch('subsecond') * 1000 as integer))`),
  },
  (t) => [uniqueIndex("model_versions_model_version_idx").on(t.modelId, t.version), index("model_versions_model_idx").on(t.modelId)],
);
