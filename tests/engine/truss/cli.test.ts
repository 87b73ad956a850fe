// `npm run -s analyze -- file`: JSON on stdout, exit 2 with named errors for bad input, 1 when unreadable.
import { spawnSync } from "node:child_process";
import path from "node:path";
import { describe, expect, it } from "vitest";

const root = path.join(import.meta.dirname, "../../..");
const fixtures = path.join(root, "tests/fixtures/models/analysis");
const run = (file: string) =>
  spawnSync(process.execPath, [path.join(root, "scripts/run-tool.mjs"), "analyze", file], { cwd: root, encoding: "utf8", env: { ...process.env, STRUTWISE_QUIET_BUNDLE: "1" } });

describe("analyze command line", () => {
  it("prints the analysis with the result format's field names", () => {
    const r = run(path.join(fixtures, "roof-warren-2d.truss.json"));
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out).toMatchObject({ format: "strutwise.analysis", model: expect.stringContaining("Warren"), units: { length: "mm", force: "N", mass: "t" } });
    for (const k of ["volume", "mass", "equilibriumResidual", "members", "nodes", "reactions"]) expect(out).toHaveProperty(k);
    const b12 = out.members.find((m: { id: string }) => m.id === "b12");
    expect(b12.force.LC1).toBeCloseTo(45000, 6); // method of joints, see closed-form.test.ts
    expect(b12.stress.LC1).toBeCloseTo(45000 / 1200, 9);
    expect(out.nodes[1].displacement.LC2).toHaveLength(3);
  });
  it("exits 2 with the errors on stderr for an invalid model", () => {
    const r = run(path.join(fixtures, "broken-references.truss.json"));
    expect(r.status).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(/members\[1\]\.end: member BC: ends at unknown node "X"/);
    expect(r.stderr).toMatch(/member CA: uses material "timber"/);
  });
  it("exits 2 naming the node of a mechanism", () => {
    const r = run(path.join(fixtures, "mechanism-unbraced.truss.json"));
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/nodes [CD] and [CD] can move together in x without straining any member/);
  });
  it("exits 2 for malformed JSON and 1 for a missing file", () => {
    expect(run(path.join(fixtures, "broken-json.truss.json")).status).toBe(2);
    const r = run(path.join(fixtures, "does-not-exist.truss.json"));
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/cannot read .*no such file/);
  });
});
