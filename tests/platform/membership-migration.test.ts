// The membership migrations applied to an existing database with data (issue 14): a desk
// migrated up to just before project_members, seeded with accounts, projects, models and jobs,
// copied, and the copy brought up to date with the committed migrations. Every project's
// creator, uploaders and submitters become members; nobody else does; the data stays.
// Then the same on a copy of the demo desk as the seed makes it (every row carried over into a
// database at the schema before project_members): every row of every table unchanged, the
// members exactly the creators, uploaders and submitters, the app's lists scoped by them, and
// the seed of `npm start` running on the upgraded copy.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { createClient, type Client } from "@libsql/client";
import { drizzle } from "drizzle-orm/libsql";
import { migrate } from "drizzle-orm/libsql/migrator";
import { describe, expect, it } from "vitest";
import { startTestServices } from "../support/services";

const FIRST_NEW = "0007_project_members";

/** A copy of drizzle/ holding only the migrations before `tag`. */
function migrationsBefore(tag: string): string {
  const src = path.resolve("drizzle");
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "strutwise-mig-"));
  fs.cpSync(src, dir, { recursive: true });
  const journal = JSON.parse(fs.readFileSync(path.join(dir, "meta/_journal.json"), "utf8")) as { entries: { tag: string }[] };
  const cut = journal.entries.findIndex((e) => e.tag === tag);
  expect(cut, `${tag} is in the journal`).toBeGreaterThan(0);
  journal.entries = journal.entries.slice(0, cut);
  fs.writeFileSync(path.join(dir, "meta/_journal.json"), JSON.stringify(journal));
  return dir;
}

describe("membership migrations on a seeded database", () => {
  it("make existing creators, uploaders and submitters members, and keep every row", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "strutwise-seeded-"));
    const original = path.join(dir, "before.db");
    const old = createClient({ url: `file:${original}` });
    await migrate(drizzle(old), { migrationsFolder: migrationsBefore(FIRST_NEW) });
    const now = Date.now();
    const users = ["u-creator", "u-uploader", "u-submitter", "u-bystander"];
    for (const id of users)
      await old.execute({ sql: "insert into user (id, name, email, email_verified, created_at, updated_at, role) values (?, ?, ?, 1, ?, ?, 'engineer')", args: [id, id, `${id}@saltcote.example`, now, now] });
    await old.execute({ sql: "insert into projects (id, code, name, created_by) values ('p1', 'SC-1', 'Saltcote granary roof', 'u-creator'), ('p2', 'SC-2', 'Saltcote bridge', NULL)", args: [] });
    await old.execute({
      sql: `insert into models (id, project_id, name, file_name, file_key, sha256, size_bytes, dimension, node_count, member_count, has_design, summary, warnings, uploaded_by)
            values ('m1', 'p1', 'granary truss', 'g.json', 'models/m1.json', ?, 10, 2, 3, 3, 1, '{}', '[]', 'u-uploader'),
                   ('m2', 'p2', 'bridge truss', 'b.json', 'models/m2.json', ?, 10, 2, 3, 3, 1, '{}', '[]', 'u-uploader')`,
      args: ["0".repeat(64), "1".repeat(64)],
    });
    await old.execute({ sql: "insert into jobs (id, project_id, model_id, submitted_by, status, options) values ('j1', 'p1', 'm1', 'u-submitter', 'succeeded', '{}'), ('j2', 'p2', 'm2', NULL, 'queued', '{}')", args: [] });
    old.close();

    // the copy is what gets migrated, as an operator would try it first
    const copy = path.join(dir, "copy.db");
    fs.copyFileSync(original, copy);
    const client = createClient({ url: `file:${copy}` });
    const { migrateDb } = await import("~/db/migrate.server");
    await migrateDb(drizzle(client) as never);

    const members = (await client.execute("select project_id, user_id from project_members order by project_id, user_id")).rows.map((r) => `${r.project_id}:${r.user_id}`);
    expect(members).toEqual(["p1:u-creator", "p1:u-submitter", "p1:u-uploader", "p2:u-uploader"]);
    for (const [table, n] of [["user", 4], ["projects", 2], ["models", 2], ["jobs", 2]] as const) {
      expect((await client.execute(`select count(*) as n from ${table}`)).rows[0]!.n, table).toBe(n);
    }
    // the members' own job rows (member_jobs) are filled for the jobs already there
    const memberJobs = (await client.execute("select user_id, job_id, project_id, status from member_jobs order by job_id, user_id")).rows.map((r) => `${r.job_id}:${r.user_id}:${r.project_id}:${r.status}`);
    expect(memberJobs).toEqual(["j1:u-creator:p1:succeeded", "j1:u-submitter:p1:succeeded", "j1:u-uploader:p1:succeeded", "j2:u-uploader:p2:queued"]);
    // the list filter's index is there
    const idx = (await client.execute("select name from sqlite_master where type = 'index' and tbl_name = 'project_members'")).rows.map((r) => r.name);
    expect(idx).toContain("project_members_user_idx");
    // applying again changes nothing
    await migrateDb(drizzle(client) as never);
    expect((await client.execute("select count(*) as n from project_members")).rows[0]!.n).toBe(4);
    expect((await client.execute("select count(*) as n from member_jobs")).rows[0]!.n).toBe(4);
    client.close();
  });
});

/** Copy every row of `from` into the tables `to` has, column by column (those both have). */
async function copyRows(from: Client, to: Client): Promise<Record<string, number>> {
  const tables = (await to.execute("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' and name not like '__drizzle%'")).rows.map((r) => String(r.name));
  const counts: Record<string, number> = {};
  await to.execute("PRAGMA foreign_keys=OFF");
  for (const t of tables) {
    const cols = async (c: Client) => (await c.execute(`PRAGMA table_info("${t}")`)).rows.map((r) => String(r.name));
    const mine = new Set(await cols(from));
    const shared = (await cols(to)).filter((c) => mine.has(c));
    const rows = (await from.execute(`select ${shared.map((c) => `"${c}"`).join(", ")} from "${t}"`)).rows;
    for (const r of rows) await to.execute({ sql: `insert into "${t}" (${shared.map((c) => `"${c}"`).join(", ")}) values (${shared.map(() => "?").join(", ")})`, args: shared.map((c) => r[c] as never) });
    counts[t] = rows.length;
  }
  return counts;
}

describe("the membership migrations on a copy of the demo desk", () => {
  it("a desk seeded before membership, migrated: its people become members, every row stays, the app lists by membership, the seed runs on it", async () => {
    const services = await startTestServices();
    try {
      const { db } = await import("~/db/client.server");
      const { migrateDb } = await import("~/db/migrate.server");
      const schema = await import("~/db/schema");
      const { seed } = await import("../../scripts/seed");
      // the demo desk as `npm start` seeds it, with one more engineer's model and run in a project
      await migrateDb(db());
      const report = await seed(db());
      const other = await db().insert(schema.user).values({ id: "u-second-engineer", name: "Second engineer", email: "second@saltcote.example", emailVerified: true, role: "engineer", createdAt: new Date(), updatedAt: new Date() }).returning();
      const [aModel] = await db().select().from(schema.models).limit(1);
      await db().insert(schema.jobs).values({ id: "j-second", projectId: aModel!.projectId, modelId: aModel!.id, submittedBy: other[0]!.id, status: "succeeded", options: {} });

      // the same rows in a database at the schema before project_members
      const dir = fs.mkdtempSync(path.join(os.tmpdir(), "strutwise-demo-"));
      const original = path.join(dir, "before.db");
      const old = createClient({ url: `file:${original}` });
      await migrate(drizzle(old), { migrationsFolder: migrationsBefore(FIRST_NEW) });
      const counts = await copyRows(db().$client, old);
      expect(counts.projects).toBeGreaterThan(0);
      expect(counts.jobs).toBeGreaterThan(1);
      const columns: Record<string, string> = {};
      for (const t of Object.keys(counts)) columns[t] = (await old.execute(`PRAGMA table_info("${t}")`)).rows.map((r) => `"${String(r.name)}"`).join(", ");
      const snapshot = async (c: Client) => {
        const out: Record<string, unknown[]> = {};
        for (const t of Object.keys(counts)) out[t] = (await c.execute(`select ${columns[t]} from "${t}" order by rowid`)).rows.map((r) => JSON.stringify(Object.values(r)));
        return out;
      };
      const before = await snapshot(old);
      // who should become a member: creators, uploaders and submitters, from the rows themselves
      const expectedMembers = new Set<string>();
      for (const sql of ["select id as p, created_by as u from projects", "select project_id as p, uploaded_by as u from models", "select project_id as p, submitted_by as u from jobs"])
        for (const r of (await old.execute(sql)).rows) if (r.u) expectedMembers.add(`${r.p}:${r.u}`);
      old.close();

      // an operator tries the upgrade on a copy first
      const copy = path.join(dir, "copy.db");
      fs.copyFileSync(original, copy);
      const client = createClient({ url: `file:${copy}` });
      const upgraded = drizzle(client, { schema }) as never as Awaited<ReturnType<typeof db>>;
      await migrateDb(upgraded);

      expect(await snapshot(client)).toEqual(before); // every row of every table, unchanged
      const members = (await client.execute("select project_id, user_id from project_members")).rows.map((r) => `${r.project_id}:${r.user_id}`);
      expect(new Set(members)).toEqual(expectedMembers);
      expect(members).toContain(`${aModel!.projectId}:u-second-engineer`);
      expect((await client.execute("PRAGMA foreign_key_check")).rows).toEqual([]);
      expect((await client.execute("PRAGMA integrity_check")).rows[0]!.integrity_check).toBe("ok");
      // the members' own job rows: exactly project_members × jobs, from the backfill
      const backfilled = await memberJobsMismatch(client);
      expect(backfilled).toMatchObject({ missing: 0, extra: 0 });
      expect(backfilled.rows).toBeGreaterThan(0);

      // the app's own lists on the upgraded copy: the second engineer sees the project they ran
      // a job in, the demo viewer (a member of nothing yet) sees nothing
      const { listJobs } = await import("~/lib/jobs/queue.server");
      const { listProjects } = await import("~/lib/auth/projects.server");
      const viewerId = String((await client.execute({ sql: "select id from user where email = ?", args: [report.accounts.find((a) => a.role === "viewer")!.email] })).rows[0]!.id);
      expect((await listProjects({ visibleTo: { id: "u-second-engineer", role: "engineer" } }, upgraded)).map((p) => p.id)).toEqual([aModel!.projectId]);
      expect((await listJobs({ visibleTo: { id: "u-second-engineer", role: "engineer" }, limit: 200 }, upgraded, { fresh: true })).jobs.map((j) => j.projectId)).toContain(aModel!.projectId);
      expect((await listJobs({ visibleTo: { id: viewerId, role: "viewer" } }, upgraded, { fresh: true })).jobs).toEqual([]);

      // `npm start` seeds after migrating: on the upgraded copy it adds no model and no run,
      // and brings the demo accounts into the demo projects
      const again = await seed(upgraded);
      expect(again.demo).toEqual({ uploaded: 0, queued: 0 });
      expect((await client.execute("select count(*) as n from jobs")).rows[0]!.n).toBe(counts.jobs);
      expect((await listJobs({ visibleTo: { id: viewerId, role: "viewer" }, limit: 200 }, upgraded, { fresh: true })).jobs.length).toBeGreaterThan(0);
      // and the triggers kept them so through the seed's new memberships
      expect(await memberJobsMismatch(client)).toMatchObject({ missing: 0, extra: 0 });
      client.close();
    } finally {
      await services.stop();
    }
  }, 300_000);
});

/** How far member_jobs is from the join it copies (project_members × jobs), and its size. */
async function memberJobsMismatch(client: Client): Promise<{ missing: number; extra: number; rows: number }> {
  const join = "select m.user_id, j.id, j.project_id, j.status, j.outcome, j.created_at from project_members m join jobs j on j.project_id = m.project_id";
  const copy = "select user_id, job_id, project_id, status, outcome, created_at from member_jobs";
  const n = async (q: string) => Number((await client.execute(`select count(*) as n from (${q})`)).rows[0]!.n);
  return { missing: await n(`${join} except ${copy}`), extra: await n(`${copy} except ${join}`), rows: await n(copy) };
}
