// Who may create an account (SIGN_UP), and when an invitation's role takes effect: only once
// the invited address has proven itself by the verification link. Until then a new account is
// a viewer that can do nothing at all (authorize.server.ts refuses unverified accounts).
// An invited address can only be registered with the invitation's own token (the link in the
// invitation mail, an HMAC of the invitation under the server secret), so nobody can
// pre-register it with a password of their own and wait for the owner to confirm it.
import { createHmac, timingSafeEqual } from "node:crypto";
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

/** Header that carries the invitation token from the sign-up page to better-auth's hook. */
export const INVITATION_HEADER = "x-strutwise-invitation";

/** The token of an invitation's link; changes when the invitation is sent again. */
export function invitationToken(inv: Pick<Invitation, "id" | "createdAt">, secret = config().BETTER_AUTH_SECRET): string {
  return createHmac("sha256", secret).update(`invitation:${inv.id}:${inv.createdAt.getTime()}`).digest("base64url");
}

function sameToken(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

/**
 * May this address create an account under the desk's SIGN_UP setting? An address with an
 * open invitation needs that invitation's token, whatever the mode.
 */
export async function signUpRefusal(email: string, database: Db = defaultDb(), token?: string | null): Promise<string | null> {
  const mode = signUpMode();
  const inv = await openInvitation(email, database);
  if (inv) {
    if (token && sameToken(token, invitationToken(inv))) return null;
    return "This address is invited: create the account from the link in the invitation mail";
  }
  if (mode.kind === "open") return null;
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
