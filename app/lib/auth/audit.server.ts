// The audit trail: one appended row per event worth answering for later (who signed in,
// uploaded, submitted, cancelled, reviewed, changed a role, made or revoked a key). Rows are
// never updated or deleted; database triggers (drizzle/*_audit_append_only.sql) refuse it.
import { and, desc, eq, gte, like, lt, or, type SQL } from "drizzle-orm";
import { db as defaultDb, type Db, type DbExecutor } from "~/db/client.server";
import { auditLog } from "~/db/schema";

export interface AuditActor {
  id: string;
  email?: string | null;
}

export interface AuditEntry {
  request?: Request;
  actor?: AuditActor | null;
  action: string; // dotted verb: "job.submit", "review.approved", "user.role-change"
  entityType?: string;
  entityId?: string;
  detail?: Record<string, unknown>;
  ip?: string | null;
}

export function clientIp(request: Request | undefined): string | null {
  const fwd = request?.headers.get("x-forwarded-for");
  return fwd ? fwd.split(",")[0]!.trim() || null : null;
}

/**
 * Append one event. Without an actor, the request's signed-in user (cookie or API key) is
 * taken. A database failure propagates: an action that cannot be recorded should not pass
 * as done.
 */
export async function audit(entry: AuditEntry, database: DbExecutor = defaultDb()): Promise<void> {
  await database.insert(auditLog).values(await auditValues(entry));
}

/** The row audit() appends, for a caller that stores it in one batch with its change. */
export async function auditValues(entry: AuditEntry): Promise<typeof auditLog.$inferInsert> {
  let actor = entry.actor ?? null;
  if (!actor && entry.request) {
    // imported lazily: authorize.server imports this module's neighbours
    const { getUser } = await import("./authorize.server");
    const u = await getUser(entry.request);
    if (u) actor = { id: u.id, email: u.email };
  }
  const detail = { ...(entry.detail ?? {}) };
  const via = entry.request?.headers.get("authorization")?.startsWith("Bearer ") ? "api-key" : undefined;
  if (via && !("via" in detail)) detail.via = via;
  return {
    actorId: actor?.id ?? null,
    actorEmail: actor?.email ?? null,
    action: entry.action,
    entityType: entry.entityType ?? null,
    entityId: entry.entityId ?? null,
    detail: Object.keys(detail).length ? detail : null,
    ip: entry.ip ?? clientIp(entry.request),
  };
}

export interface AuditFilter {
  action?: string; // prefix match: "job" finds job.submit and job.cancel
  actor?: string; // part of the e-mail, or the exact user id
  from?: Date;
  to?: Date; // exclusive
  limit?: number;
  before?: number; // id cursor: rows older than this id
}

export type AuditRow = typeof auditLog.$inferSelect;

export async function listAudit(filter: AuditFilter = {}, database: Db = defaultDb()): Promise<AuditRow[]> {
  const where: SQL[] = [];
  if (filter.action) where.push(like(auditLog.action, `${escapeLike(filter.action)}%`));
  if (filter.actor) where.push(or(eq(auditLog.actorId, filter.actor), like(auditLog.actorEmail, `%${escapeLike(filter.actor)}%`))!);
  if (filter.from) where.push(gte(auditLog.at, filter.from));
  if (filter.to) where.push(lt(auditLog.at, filter.to));
  if (filter.before) where.push(lt(auditLog.id, filter.before));
  return database
    .select()
    .from(auditLog)
    .where(where.length ? and(...where) : undefined)
    .orderBy(desc(auditLog.id))
    .limit(Math.min(Math.max(filter.limit ?? 100, 1), 500));
}

function escapeLike(s: string): string {
  return s.replace(/[%_]/g, "");
}
