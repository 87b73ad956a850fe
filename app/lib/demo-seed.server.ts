// The demo desk: every model of demo/models/ uploaded (through storeModel, like any upload)
// into the seeded project it belongs to, with one queued optimization each, so that a fresh
// `npm start` shows finished results once the worker has run them. Safe to run on every
// start: a model already there (same project, same bytes) and its job are left alone.
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { asc, eq } from "drizzle-orm";
import type { Db } from "~/db/client.server";
import { jobs, projects, user } from "~/db/schema";
import { enqueueJob } from "~/lib/jobs/queue.server";
import { findModelBySha, storeModel } from "~/lib/models.server";

export interface SeedAccount {
  role: string;
  email: string;
}

// Which seeded project a demo file belongs to, by words in its file name; files that match
// none are spread over the projects in code order.
const PROJECT_HINTS: { words: RegExp; code: string }[] = [
  { words: /roof|hall|market|warren|shed|canopy/i, code: "TK-2041" },
  { words: /bridge|footbridge|deck|millrace/i, code: "TK-2057" },
  { words: /mast|tower|lattice|relay|3d/i, code: "TK-2063" },
];

export function demoModelsDir(): string {
  return path.resolve(process.cwd(), "demo", "models");
}

export async function seedDemoData(db: Db, accounts: SeedAccount[], dir = demoModelsDir()): Promise<{ uploaded: number; queued: number }> {
  const out = { uploaded: 0, queued: 0 };
  if (!fs.existsSync(dir)) {
    console.log(`[seed] no demo models: ${dir} does not exist`);
    return out;
  }
  const files = fs
    .readdirSync(dir)
    .filter((f) => f.endsWith(".json"))
    .sort();
  const allProjects = await db.select({ id: projects.id, code: projects.code }).from(projects).orderBy(asc(projects.code));
  if (allProjects.length === 0) {
    console.log("[seed] no projects to put the demo models in");
    return out;
  }
  const engineerEmail = accounts.find((a) => a.role === "engineer")?.email ?? accounts[0]?.email;
  const submitter = engineerEmail ? ((await db.select({ id: user.id }).from(user).where(eq(user.email, engineerEmail)).limit(1))[0] ?? null) : null;

  let spread = 0;
  for (const file of files) {
    const hinted = PROJECT_HINTS.find((h) => h.words.test(file));
    const project = (hinted && allProjects.find((p) => p.code === hinted.code)) ?? allProjects[spread++ % allProjects.length]!;
    const bytes = new Uint8Array(fs.readFileSync(path.join(dir, file)));
    const sha = createHash("sha256").update(bytes).digest("hex");

    let model = await findModelBySha(project.id, sha, db);
    if (!model) {
      const stored = await storeModel({ projectId: project.id, fileName: file, bytes, user: submitter }, db);
      if (!stored.ok) {
        // a demo file the engine refuses is a bug in the demo, not a reason to stop the start
        console.error(`[seed] demo model ${file} refused: ${stored.error}`);
        continue;
      }
      model = stored.model;
      out.uploaded++;
    }
    if (!model.hasDesign) continue;
    const existing = await db.select({ id: jobs.id }).from(jobs).where(eq(jobs.modelId, model.id)).limit(1);
    if (existing.length === 0) {
      await enqueueJob({ modelId: model.id, options: {}, user: submitter }, db);
      out.queued++;
    }
  }
  if (out.uploaded || out.queued) console.log(`[seed] demo models: ${out.uploaded} uploaded, ${out.queued} jobs queued`);
  return out;
}
