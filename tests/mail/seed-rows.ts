// Minimal rows for the notification and report tests: people, a project, a model and a job,
// written straight into the test database (the queue and sign-in code are not needed here).
import { db } from "~/db/client.server";
import { jobs, models, projectMembers, projects, reviews, user } from "~/db/schema";

export async function insertUser(id: string, name: string, email: string, role: string) {
  const now = new Date("2026-11-30T08:00:00Z");
  await db().insert(user).values({ id, name, email, role, emailVerified: true, createdAt: now, updatedAt: now });
}

export async function insertJob(opts: {
  jobId: string;
  submittedBy: string;
  status?: "queued" | "running" | "succeeded" | "failed" | "cancelled";
  outcome?: "optimal" | "not-converged" | "infeasible" | "failed";
  error?: string;
  resultKey?: string;
  modelFileKey?: string;
  modelName?: string;
  sha256?: string;
  summary?: unknown;
  /** the model's stored summary (its units name the objective's unit in the mail) */
  modelSummary?: unknown;
  /** project members besides the submitter; default: every account inserted so far */
  members?: string[];
}) {
  const projectId = `p-${opts.jobId}`;
  const modelId = `m-${opts.jobId}`;
  await db().insert(projects).values({ id: projectId, code: `HX-${opts.jobId.slice(-3)}`, name: "Harrowgate Exchange canopy", client: "Lindqvist & Marr Developments" });
  const memberIds = opts.members ?? (await db().select({ id: user.id }).from(user)).map((u) => u.id);
  for (const m of new Set([opts.submittedBy, ...memberIds])) await db().insert(projectMembers).values({ projectId, userId: m }).onConflictDoNothing();
  await db().insert(models).values({
    id: modelId,
    projectId,
    name: opts.modelName ?? "Canopy truss, option C",
    fileName: "canopy-c.truss.json",
    fileKey: opts.modelFileKey ?? `models/${modelId}.json`,
    sha256: opts.sha256 ?? "0".repeat(64),
    sizeBytes: 1234,
    dimension: 2,
    nodeCount: 13,
    memberCount: 23,
    hasDesign: true,
    summary: (opts.modelSummary ?? {}) as never,
    warnings: [],
    uploadedBy: opts.submittedBy,
  });
  await db().insert(jobs).values({
    id: opts.jobId,
    projectId,
    modelId,
    submittedBy: opts.submittedBy,
    status: opts.status ?? "succeeded",
    outcome: opts.outcome ?? (opts.status === undefined || opts.status === "succeeded" ? "optimal" : undefined),
    options: {},
    error: opts.error,
    resultKey: opts.resultKey,
    summary: opts.summary as never,
    createdAt: new Date("2026-11-30T09:00:00Z"),
    startedAt: new Date("2026-11-30T09:00:05Z"),
    finishedAt: new Date("2026-11-30T09:01:10Z"),
  });
}

export async function insertReview(id: string, jobId: string, reviewerId: string, decision: "approved" | "changes-requested", comment: string, at: Date) {
  await db().insert(reviews).values({ id, jobId, reviewerId, decision, comment, createdAt: at });
}
