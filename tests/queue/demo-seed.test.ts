// seedDemoData: demo files go through the upload gate into the project their name points to,
// each gets one queued job, and a second run changes nothing.
import fs from "node:fs";
import path from "node:path";
import { count } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Db } from "~/db/client.server";
import type { TestServices } from "../support/services";
import { twoBarModel, mechanismModel } from "./support/models";
import { makeAccount, setupQueue } from "./support/setup";

let services: TestServices;
let database: Db;

beforeAll(async () => {
  ({ services, db: database } = await setupQueue());
});
afterAll(async () => services?.stop());

describe("seedDemoData", () => {
  it("uploads each demo model into its project with one job, idempotently, and skips a refused file", async () => {
    const { projects, models, jobs } = await import("~/db/schema");
    const { seedDemoData } = await import("~/lib/demo-seed.server");
    const engineer = await makeAccount("engineer", "Casimir Lund");
    await database.insert(projects).values([
      { id: "p-roof", code: "TK-2041", name: "Ellerby Quay fish-market hall roof" },
      { id: "p-bridge", code: "TK-2057", name: "Millrace footbridge" },
    ]);
    const dir = path.join(services.dir, "demo-models");
    fs.mkdirSync(dir);
    fs.writeFileSync(path.join(dir, "market-roof.truss.json"), JSON.stringify(twoBarModel("Market hall roof bay")));
    fs.writeFileSync(path.join(dir, "millrace-footbridge.truss.json"), JSON.stringify(twoBarModel("Millrace span")));
    fs.writeFileSync(path.join(dir, "broken-bridge.truss.json"), JSON.stringify(mechanismModel()));
    const accounts = [{ role: "engineer", email: engineer.email }];

    const first = await seedDemoData(database, accounts, dir);
    expect(first).toEqual({ uploaded: 2, queued: 2 });
    const placed = await database.select({ name: models.name, projectId: models.projectId, uploadedBy: models.uploadedBy }).from(models);
    expect(placed).toContainEqual({ name: "Market hall roof bay", projectId: "p-roof", uploadedBy: engineer.id });
    expect(placed).toContainEqual({ name: "Millrace span", projectId: "p-bridge", uploadedBy: engineer.id });

    const second = await seedDemoData(database, accounts, dir);
    expect(second).toEqual({ uploaded: 0, queued: 0 });
    const [{ n: modelCount }] = (await database.select({ n: count() }).from(models)) as [{ n: number }];
    const [{ n: jobCount }] = (await database.select({ n: count() }).from(jobs)) as [{ n: number }];
    expect([modelCount, jobCount]).toEqual([2, 2]);
  });
});
