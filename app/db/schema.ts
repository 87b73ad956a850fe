// The database schema: better-auth's tables (auth-schema.ts) plus the desk's own.
// Timestamps are integer milliseconds; JSON columns hold plain objects.
import { sql } from "drizzle-orm";
import { index, integer, sqliteTable, text, uniqueIndex, real } from "drizzle-orm/sqlite-core";
import { user } from "./auth-schema";

export * from "./auth-schema";

const createdAt = () =>
  integer("created_at", { mode: "timestamp_ms" })
    .notNull()
    .default(sql`(cast(unixepoch('subsecond') * 1000 as integer))`);

export const projects = sqliteTable("projects", {
  id: text("id").primaryKey(),
  code: text("code").notNull().unique(),
  name: text("name").notNull(),
  client: text("client"),
  description: text("description"),
  createdBy: text("created_by").references(() => user.id),
  createdAt: createdAt(),
});

export const models = sqliteTable(
  "models",
  {
    id: text("id").primaryKey(),
    projectId: text("project_id").notNull().references(() => projects.id),
    name: text("name").notNull(),
    fileName: text("file_name").notNull(),
    fileKey: text("file_key").notNull(), // object key in the bucket
    sha256: text("sha256").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    dimension: integer("dimension").notNull(),
    nodeCount: integer("node_count").notNull(),
    memberCount: integer("member_count").notNull(),
    hasDesign: integer("has_design", { mode: "boolean" }).notNull(),
    summary: text("summary", { mode: "json" }).notNull(), // ModelSummary from the engine
    warnings: text("warnings", { mode: "json" }).notNull(), // ModelIssue[]
    uploadedBy: text("uploaded_by").references(() => user.id),
    createdAt: createdAt(),
  },
  (t) => [index("models_project_idx").on(t.projectId)],
);

export const JOB_STATUSES = ["queued", "running", "succeeded", "failed", "cancelled"] as const;
export type JobStatus = (typeof JOB_STATUSES)[number];

export const jobs = sqliteTable(
  "jobs",
  {
    id: text("id").primaryKey(),
    projectId: text("project_id").notNull().references(() => projects.id),
    modelId: text("model_id").notNull().references(() => models.id),
    submittedBy: text("submitted_by").references(() => user.id),
    status: text("status", { enum: JOB_STATUSES }).notNull().default("queued"),
    outcome: text("outcome", { enum: ["optimal", "not-converged", "infeasible", "failed", "analysed"] }),
    options: text("options", { mode: "json" }).notNull(), // JobOptions
    attempts: integer("attempts").notNull().default(0),
    maxAttempts: integer("max_attempts").notNull().default(3),
    workerId: text("worker_id"),
    leaseExpiresAt: integer("lease_expires_at", { mode: "timestamp_ms" }),
    cancelRequested: integer("cancel_requested", { mode: "boolean" }).notNull().default(false),
    createdAt: createdAt(),
    startedAt: integer("started_at", { mode: "timestamp_ms" }),
    finishedAt: integer("finished_at", { mode: "timestamp_ms" }),
    error: text("error"),
    resultKey: text("result_key"),
    kind: text("kind", { enum: ["design", "analysis"] }).notNull().default("design"),
    modelVersion: integer("model_version"), // the model version the job ran (null only for jobs older than versions)
    summary: text("summary", { mode: "json" }), // JobSummary: objective initial/final, iterations, max utilization
    // latest progress, throttled writes from the worker
    progressIteration: integer("progress_iteration"),
    progressObjective: real("progress_objective"),
    progressMaxViolation: real("progress_max_violation"),
    progressKktResidual: real("progress_kkt_residual"),
    progressAt: integer("progress_at", { mode: "timestamp_ms" }),
    // a job handed back because a service it needs did not answer ("storage"): the page says
    // so, and no worker takes it again before available_at
    waitingFor: text("waiting_for"),
    availableAt: integer("available_at", { mode: "timestamp_ms" }),
    // the run a checker returned with "changes requested" that this run answers (the returned
    // run lists its answers through this column too); checked to be a run of the same model
    answersJobId: text("answers_job_id"),
  },
  (t) => [
    index("jobs_status_created_idx").on(t.status, t.createdAt),
    index("jobs_project_idx").on(t.projectId, t.createdAt),
    // newest-first listing (created_at, id) without a sort, with and without a status filter
    index("jobs_created_id_idx").on(t.createdAt, t.id),
    index("jobs_status_created_id_idx").on(t.status, t.createdAt, t.id),
    index("jobs_model_idx").on(t.modelId),
    index("jobs_answers_idx").on(t.answersJobId),
  ],
);

// Per-iteration history of a running job, for the live convergence plot.
export const jobProgress = sqliteTable(
  "job_progress",
  {
    jobId: text("job_id").notNull().references(() => jobs.id, { onDelete: "cascade" }),
    attempt: integer("attempt").notNull(),
    iteration: integer("iteration").notNull(),
    objective: real("objective"),
    maxViolation: real("max_violation"),
    kktResidual: real("kkt_residual"),
    at: integer("at", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [uniqueIndex("job_progress_pk").on(t.jobId, t.attempt, t.iteration)],
);

// Review decisions are append-only: a later decision supersedes, never edits, an earlier one.
export const reviews = sqliteTable(
  "reviews",
  {
    id: text("id").primaryKey(),
    jobId: text("job_id").notNull().references(() => jobs.id),
    reviewerId: text("reviewer_id").notNull().references(() => user.id),
    // "reopened": an admin withdrew an approval, with the reason as comment (no CHECK in SQLite: no migration)
    decision: text("decision", { enum: ["approved", "changes-requested", "reopened"] }).notNull(),
    comment: text("comment").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("reviews_job_idx").on(t.jobId, t.createdAt)],
);

export const auditLog = sqliteTable(
  "audit_log",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    at: createdAt(),
    actorId: text("actor_id"),
    actorEmail: text("actor_email"),
    action: text("action").notNull(), // e.g. "job.submit", "review.approve", "user.role-change"
    entityType: text("entity_type"),
    entityId: text("entity_id"),
    detail: text("detail", { mode: "json" }),
    ip: text("ip"),
  },
  (t) => [index("audit_at_idx").on(t.at), index("audit_action_idx").on(t.action, t.at)],
);

export const apiKeys = sqliteTable("api_keys", {
  id: text("id").primaryKey(),
  userId: text("user_id").notNull().references(() => user.id),
  name: text("name").notNull(),
  prefix: text("prefix").notNull(), // first characters, shown in lists
  hash: text("hash").notNull().unique(), // sha256 of the whole key; the key itself is shown once
  createdAt: createdAt(),
  lastUsedAt: integer("last_used_at", { mode: "timestamp_ms" }),
  revokedAt: integer("revoked_at", { mode: "timestamp_ms" }),
});

export const invitations = sqliteTable("invitations", {
  id: text("id").primaryKey(),
  email: text("email").notNull().unique(),
  role: text("role", { enum: ["admin", "engineer", "checker", "viewer"] }).notNull(),
  invitedBy: text("invited_by").references(() => user.id),
  createdAt: createdAt(),
  acceptedAt: integer("accepted_at", { mode: "timestamp_ms" }),
});
export * from "./tables/catalogues";
export * from "./tables/model-versions";
export * from "./tables/project-members";
export * from "./tables/mail-outbox";
export * from "./tables/sign-in-throttle";
export * from "./tables/user-preferences";
export * from "./tables/member-jobs";
