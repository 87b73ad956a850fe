// One job with the model it ran, the project it belongs to and the account that submitted it:
// the rows the notification mails and the calculation report both start from.
import { eq } from "drizzle-orm";
import { db, type DbExecutor } from "~/db/client.server";
import { jobs, models, projects, user } from "~/db/schema";

export interface JobWithModel {
  job: typeof jobs.$inferSelect;
  model: typeof models.$inferSelect;
  project: typeof projects.$inferSelect;
  /** null when the job has no submitter any more (an account removed, a scripted seed) */
  submitter: { id: string; name: string; email: string } | null;
}

/** The job's rows, or null when there is no job of that id. */
export async function loadJobWithModel(jobId: string, database: DbExecutor = db()): Promise<JobWithModel | null> {
  const rows = await database
    .select({ job: jobs, model: models, project: projects, submitterId: user.id, submitterName: user.name, submitterEmail: user.email })
    .from(jobs)
    .innerJoin(models, eq(models.id, jobs.modelId))
    .innerJoin(projects, eq(projects.id, jobs.projectId))
    .leftJoin(user, eq(user.id, jobs.submittedBy))
    .where(eq(jobs.id, jobId))
    .limit(1);
  const r = rows[0];
  if (!r) return null;
  const submitter = r.submitterId && r.submitterEmail ? { id: r.submitterId, name: r.submitterName ?? "", email: r.submitterEmail } : null;
  return { job: r.job, model: r.model, project: r.project, submitter };
}
