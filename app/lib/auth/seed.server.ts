// Demo accounts of the invented firm Tarrow & Keel Structural (scripts/seed.ts has the rest of
// the scenario): one person per role. Safe to run
// on every start: existing accounts keep their data and get their demo role back.
import { randomUUID } from "node:crypto";
import { hashPassword } from "better-auth/crypto";
import { eq } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { account, user } from "~/db/schema";
import type { Role } from "./permissions";

export interface DemoAccount {
  role: Role;
  email: string;
  password: string;
  name: string;
}

export const DEMO_ACCOUNTS: DemoAccount[] = [
  { role: "admin", name: "Maren Oduya", email: "maren.oduya@tarrowkeel.example", password: "keel-admin-demo" },
  { role: "engineer", name: "Casimir Lund", email: "casimir.lund@tarrowkeel.example", password: "keel-engineer-demo" },
  { role: "checker", name: "Priya Halvorsen", email: "priya.halvorsen@tarrowkeel.example", password: "keel-checker-demo" },
  { role: "viewer", name: "Jonah Ekwueme", email: "jonah.ekwueme@tarrowkeel.example", password: "keel-viewer-demo" },
];

export async function seedDemoAccounts(db: Db): Promise<{ role: Role; email: string; password: string; id: string; name: string }[]> {
  const out = [];
  for (const a of DEMO_ACCOUNTS) {
    const now = new Date();
    let row = await db.query.user.findFirst({ where: eq(user.email, a.email) });
    if (!row) {
      const id = randomUUID();
      // the same password hashing better-auth uses at sign-up, so these accounts sign in normally
      const hash = await hashPassword(a.password);
      await db.transaction(async (tx) => {
        await tx.insert(user).values({ id, name: a.name, email: a.email, emailVerified: true, role: a.role, createdAt: now, updatedAt: now });
        await tx.insert(account).values({ id: randomUUID(), accountId: id, providerId: "credential", userId: id, password: hash, createdAt: now, updatedAt: now });
      });
      row = (await db.query.user.findFirst({ where: eq(user.id, id) }))!;
    } else if (row.role !== a.role || row.banned) {
      await db.update(user).set({ role: a.role, banned: false, updatedAt: now }).where(eq(user.id, row.id));
    }
    out.push({ role: a.role, email: a.email, password: a.password, id: row.id, name: a.name });
  }
  return out;
}
