// Who may create an account (SIGN_UP), and when an invitation's role takes effect: only once
// the invited address has proven itself by the verification link. Until then a new account is
// a viewer that can do nothing at all (authorize.server.ts refuses unverified accounts), so
// whoever registers an invited address first gains nothing without that mailbox.
import { and, eq, isNull } from "drizzle-orm";
import { db as defaultDb, type Db } from "~/db/client.server";
import { invitations, user } from "~/db/schema";
import { config, signUpMode } from "~/lib/config.server";
import { audit } from "./audit.server";

export type Invitation = typeof invitations.$inferSelect;

export function invitationExpiresAt(inv: Pick<Invitation, "createdAt">, ttlDays = config().INVITATION_TTL_DAYS): Date {
  return new Date(inv.createdAt.getTime() + ttlDays * 24 * 60 * 60 * 1000);
}

/** The invitation of this address if it is neither accepted nor expired. */
export async function openInvitation(email: string, database: Db = defaultDb(), now = new Date()): Promise<Invitation | null> {
  const inv = await database.query.invitations.findFirst({
    where: and(eq(invitations.email, email.trim().toLowerCase()), isNull(invitations.acceptedAt)),
  });
  if (!inv || invitationExpiresAt(inv) <= now) return null;
  return inv;
}

/** May this address create an account under the desk's SIGN_UP setting? */
export async function signUpRefusal(email: string, database: Db = defaultDb()): Promise<string | null> {
  const mode = signUpMode();
  if (mode.kind === "open") return null;
  if (await openInvitation(email, database)) return null;
  const domain = email.trim().toLowerCase().split("@").at(-1) ?? "";
  if (mode.kind === "domain" && mode.domains.includes(domain)) return null;
  return mode.kind === "domain"
    ? `Accounts on this desk are for addresses at ${mode.domains.join(", ")}, or by invitation; ask an administrator to invite you`
    : "Accounts on this desk are by invitation only (or the invitation has expired); ask an administrator to invite you";
}

/**
 * The address is proven: apply its open invitation's role (if any) and mark it accepted.
 * An expired invitation gives nothing; the account stays a viewer.
 */
export async function applyInvitationAfterVerification(account: { id: string; email: string }, database: Db = defaultDb()): Promise<void> {
  const inv = await openInvitation(account.email, database);
  if (!inv) return;
  await database.update(user).set({ role: inv.role, updatedAt: new Date() }).where(eq(user.id, account.id));
  await database.update(invitations).set({ acceptedAt: new Date() }).where(eq(invitations.id, inv.id));
  await audit(
    {
      actor: { id: account.id, email: account.email },
      action: "user.invitation-accepted",
      entityType: "user",
      entityId: account.id,
      detail: { role: inv.role, invitedBy: inv.invitedBy },
    },
    database,
  );
}
