// The membership migrations applied to an existing database with data (issue 14): a desk
// migrated up to just before project_members, seeded with accounts, projects, models and jobs,
// copied, and the copy brought up to date with the committed migrations. Every project's
// creator, uploaders and submitters become members; nobody else does; the data stays.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { createClient } from "@libsql/client";
import { drizzle } from "drizzle-orm/libsql";
import { migrate } from "drizzle-orm/libsql/migrator";
import { describe, expect, it } from "vitest";

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
    // the list filter's index is there
    const idx = (await client.execute("select name from sqlite_master where type = 'index' and tbl_name = 'project_members'")).rows.map((r) => r.name);
    expect(idx).toContain("project_members_user_idx");
    // applying again changes nothing
    await migrateDb(drizzle(client) as never);
    expect((await client.execute("select count(*) as n from project_members")).rows[0]!.n).toBe(4);
    client.close();
  });
});
