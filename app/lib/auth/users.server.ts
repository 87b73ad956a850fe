// Account administration: invitations with a role, role changes, suspension. Each change is
// written to the audit trail with who did it and the before/after values.
import { randomUUID } from "node:crypto";
import { and, asc, desc, eq, isNull } from "drizzle-orm";
import { db as defaultDb, type Db } from "~/db/client.server";
import { apiKeys, invitations, session, user } from "~/db/schema";
import { config } from "~/lib/config.server";
import { enqueueMail } from "~/lib/mail/outbox.server";
import { plainText } from "~/lib/text-hygiene";
import { audit } from "./audit.server";
import { invitationToken } from "./sign-up-policy.server";
import type { SessionUser } from "./authorize.server";
import type { Role } from "./permissions";

export type Outcome = { ok: true; message: string } | { ok: false; field?: string; message: string };

export async function listUsers(database: Db = defaultDb()) {
  return database
    .select({ id: user.id, name: user.name, email: user.email, role: user.role, banned: user.banned, createdAt: user.createdAt })
    .from(user)
    .orderBy(asc(user.email));
}

export async function listOpenInvitations(database: Db = defaultDb()) {
  return database.select().from(invitations).where(isNull(invitations.acceptedAt)).orderBy(desc(invitations.createdAt));
}

export async function inviteUser(
  opts: { email: string; role: Role; by: SessionUser; request?: Request },
  database: Db = defaultDb(),
): Promise<Outcome> {
  const email = opts.email.toLowerCase();
  const existing = await database.query.user.findFirst({ where: eq(user.email, email) });
  if (existing) return { ok: false, field: "email", message: `${email} has an account already; change its role in the list instead` };
  // re-inviting replaces the role of an open invitation
  const [inv] = await database
    .insert(invitations)
    .values({ id: randomUUID(), email, role: opts.role, invitedBy: opts.by.id })
    // re-inviting also restarts the invitation's time (INVITATION_TTL_DAYS)
    .onConflictDoUpdate({ target: invitations.email, set: { role: opts.role, invitedBy: opts.by.id, acceptedAt: null, createdAt: new Date() } })
    .returning();
  await audit({ request: opts.request, actor: opts.by, action: "user.invite", entityType: "invitation", entityId: email, detail: { role: opts.role } }, database);
  await sendInvitationMail(email, opts.role, opts.by, invitationToken(inv!), database);
  return {
    ok: true,
    message: `${email} is invited as ${opts.role} for ${config().INVITATION_TTL_DAYS} days. Once they create an account with that address and confirm it by the link we mail them, it gets this role.`,
  };
}

/** Through the outbox like every mail; one per invitation sent (a re-invite mails again). */
async function sendInvitationMail(email: string, role: Role, by: SessionUser, token: string, database: Db): Promise<void> {
  const c = config();
  const link = `${c.APP_URL.replace(/\/$/, "")}/sign-up?email=${encodeURIComponent(email)}&invitation=${token}`;
  await enqueueMail(database, {
    kind: "invitation",
    dedupeKey: `invitation:${email}:${Date.now()}`,
    entity: { type: "invitation", id: email },
    to: email,
    subject: "Strutwise: you are invited to a truss optimization desk",
    text:
      `Hello,\n\n${plainText(by.name) || "An administrator"} invited this address to the Strutwise desk as ${role}.\n` +
      `Create your account within ${c.INVITATION_TTL_DAYS} days here:\n\n${link}\n\n` +
      `We then send a second link to confirm the address; the role applies once it is confirmed.\n`,
  });
}

export async function changeRole(
  opts: { userId: string; role: Role; by: SessionUser; request?: Request },
  database: Db = defaultDb(),
): Promise<Outcome> {
  const target = await database.query.user.findFirst({ where: eq(user.id, opts.userId) });
  if (!target) return { ok: false, message: `There is no account with id ${opts.userId}` };
  if (target.id === opts.by.id) return { ok: false, message: "You cannot change your own role; ask another admin (this keeps the desk from losing its last admin)" };
  if (target.role === opts.role) return { ok: true, message: `${target.email} is ${opts.role} already` };
  await database.update(user).set({ role: opts.role, updatedAt: new Date() }).where(eq(user.id, target.id));
  await audit(
    { request: opts.request, actor: opts.by, action: "user.role-change", entityType: "user", entityId: target.id, detail: { email: target.email, from: target.role, to: opts.role } },
    database,
  );
  return { ok: true, message: `${target.email} is now ${opts.role}` };
}

/** Suspend (ends every session at once and revokes every API key) or restore an account. */
export async function setBanned(
  opts: { userId: string; banned: boolean; by: SessionUser; request?: Request },
  database: Db = defaultDb(),
): Promise<Outcome> {
  const target = await database.query.user.findFirst({ where: eq(user.id, opts.userId) });
  if (!target) return { ok: false, message: `There is no account with id ${opts.userId}` };
  if (target.id === opts.by.id) return { ok: false, message: "You cannot suspend your own account" };
  await database.update(user).set({ banned: opts.banned, banReason: opts.banned ? "suspended by an admin" : null, updatedAt: new Date() }).where(eq(user.id, target.id));
  if (opts.banned) {
    await database.delete(session).where(eq(session.userId, target.id));
    // keys are revoked for good: restoring the account later does not bring them back
    await database.update(apiKeys).set({ revokedAt: new Date() }).where(and(eq(apiKeys.userId, target.id), isNull(apiKeys.revokedAt)));
  }
  await audit(
    { request: opts.request, actor: opts.by, action: opts.banned ? "user.suspend" : "user.restore", entityType: "user", entityId: target.id, detail: { email: target.email } },
    database,
  );
  return { ok: true, message: `${target.email} is ${opts.banned ? "suspended" : "restored"}` };
}
