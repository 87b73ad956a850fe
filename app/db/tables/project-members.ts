// Project membership: who may see a project and everything filed under it (models, jobs,
// results, reports, files, audit entries, mails). Admins see every project without a row here.
import { sql } from "drizzle-orm";
import { index, integer, primaryKey, sqliteTable, text } from "drizzle-orm/sqlite-core";
import { user } from "../auth-schema";
import { projects } from "../schema";

export const projectMembers = sqliteTable(
  "project_members",
  {
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => user.id, { onDelete: "cascade" }),
    addedBy: text("added_by"),
    createdAt: integer("created_at", { mode: "timestamp_ms" })
      .notNull()
      .default(sql`(cast(unixepoch('subsecond') * 1000 as integer))`),
  },
  (t) => [
    // (project, user): "is this caller a member?" in one index probe, per listed job
    primaryKey({ columns: [t.projectId, t.userId] }),
    // (user, project): "which projects does this caller belong to?"
    index("project_members_user_idx").on(t.userId, t.projectId),
  ],
);
