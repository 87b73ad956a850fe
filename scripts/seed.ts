// Demo data of the invented scenario: Tarrow & Keel Structural, a small engineering office in
// the invented harbour town of Ellerby Quay, with three jobs on its books. `seed(db)` is
// idempotent: projects are found by code, the accounts and models by their own keys, so a
// second start adds nothing twice.
//   npm run seed            migrate and seed the database of the current configuration
//   npm run seed -- --json  the same, printing the result as one JSON line (used by the tests)
import { eq, inArray } from "drizzle-orm";
import { randomUUID } from "node:crypto";
import { pathToFileURL } from "node:url";
import type { Db } from "~/db/client.server";
import { projectMembers, projects } from "~/db/schema";
import { seedDemoAccounts } from "~/lib/auth/seed.server";
import { seedDemoData } from "~/lib/demo-seed.server";
import { maxOf } from "~/engine/util/extent";

export interface DemoAccount {
  role: string;
  email: string;
  password: string;
}

export const DEMO_FIRM = "Tarrow & Keel Structural";

export const DEMO_PROJECTS = [
  {
    code: "TK-2041",
    name: "Ellerby Quay fish-market hall roof",
    client: "Ellerby Quay Harbour Trust",
    description: "Long-span roof trusses over the new covered fish market on the east pier.",
  },
  {
    code: "TK-2057",
    name: "Millrace footbridge",
    client: "Corran Valley District Council",
    description: "A 24 m pedestrian truss bridge over the old millrace behind the weaving sheds.",
  },
  {
    code: "TK-2063",
    name: "Saltings relay mast",
    client: "Brackwater Telecom Cooperative",
    description: "A lattice mast for radio relay dishes on the Saltings marsh ridge.",
  },
] as const;

export interface SeedReport {
  projects: { code: string; name: string; created: boolean }[];
  accounts: DemoAccount[];
  /** Demo models uploaded and jobs queued by this run (0 and 0 when they were there). */
  demo: { uploaded: number; queued: number };
}

export async function seed(db: Db): Promise<SeedReport> {
  const report: SeedReport = { projects: [], accounts: [], demo: { uploaded: 0, queued: 0 } };

  report.accounts = (await seedDemoAccounts(db)).map(({ role, email, password }) => ({ role, email, password }));

  const owner = report.accounts.find((a) => a.role === "engineer") ?? report.accounts[0];
  const ownerId = owner ? await userIdByEmail(db, owner.email) : null;

  for (const p of DEMO_PROJECTS) {
    const existing = await db.select({ id: projects.id }).from(projects).where(eq(projects.code, p.code)).get();
    if (!existing) {
      await db
        .insert(projects)
        .values({ id: randomUUID(), ...p, createdBy: ownerId })
        .onConflictDoNothing({ target: projects.code });
    }
    report.projects.push({ code: p.code, name: p.name, created: !existing });
  }

  // every demo account belongs to every demo project, so each role sees the scenario (issue 14)
  const demoProjectRows = await db.select({ id: projects.id }).from(projects).where(inArray(projects.code, DEMO_PROJECTS.map((p) => p.code)));
  for (const a of report.accounts) {
    const userId = await userIdByEmail(db, a.email);
    if (!userId) continue;
    for (const p of demoProjectRows) {
      await db.insert(projectMembers).values({ projectId: p.id, userId, addedBy: ownerId }).onConflictDoNothing();
    }
  }

  // the demo models of demo/models/, one queued job each (the queue part's module)
  report.demo = await seedDemoData(db, report.accounts);

  return report;
}

async function userIdByEmail(db: Db, email: string): Promise<string | null> {
  const { user } = await import("~/db/schema");
  const row = await db.select({ id: user.id }).from(user).where(eq(user.email, email)).get();
  return row?.id ?? null;
}

/** A plain-text table of the demo accounts, for the console. */
export function accountsTable(accounts: DemoAccount[]): string {
  if (accounts.length === 0) return "  (no demo accounts in this build)";
  const rows = [["role", "e-mail", "password"], ...accounts.map((a) => [a.role, a.email, a.password])];
  const widths = rows[0].map((_, i) => maxOf(rows.map((r) => r[i].length)));
  const line = (r: string[]) => "  " + r.map((c, i) => c.padEnd(widths[i])).join("  ");
  return [line(rows[0]), "  " + widths.map((w) => "-".repeat(w)).join("  "), ...rows.slice(1).map(line)].join("\n");
}

async function main() {
  const { config, ConfigError } = await import("~/lib/config.server");
  try {
    config();
  } catch (e) {
    if (e instanceof ConfigError) {
      console.error(e.message);
      process.exit(1);
    }
    throw e;
  }
  const { db } = await import("~/db/client.server");
  const { migrateDb } = await import("~/db/migrate.server");
  const { ensureBucket } = await import("~/lib/storage.server");
  await migrateDb(db());
  await ensureBucket();
  const report = await seed(db());
  if (process.argv.includes("--json")) {
    console.log(JSON.stringify(report));
  } else {
    for (const p of report.projects) console.log(`project ${p.code} ${p.name}: ${p.created ? "created" : "already there"}`);
    console.log(`demo accounts:\n${accountsTable(report.accounts)}`);
    console.log(`demo models: ${report.demo.uploaded} uploaded, ${report.demo.queued} jobs queued`);
  }
  db().$client.close();
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) {
  main().catch((e) => {
    console.error(`Seeding failed: ${e instanceof Error ? e.message : String(e)}`);
    process.exit(1);
  });
}
