// `npm run optimize` end to end (the precompiled bundle, as npm runs it): result JSON on stdout or into --out, progress on stderr, and
// the documented exit codes (0 optimal, 2 invalid input, 3 infeasible, 4 not converged).
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";

const root = path.resolve(import.meta.dirname, "../../..");
const fx = (f: string) => path.join(root, "tests/fixtures/models/design", f);
const run = (...args: string[]) =>
  spawnSync(process.execPath, [path.join(root, "scripts/run-tool.mjs"), "optimize", ...args], { cwd: root, encoding: "utf8", env: { ...process.env, STRUTWISE_QUIET_BUNDLE: "1" } });

describe("optimize command line", () => {
  it("prints the result JSON of an optimal run and exits 0", () => {
    const r = run(fx("three-bar.truss.json"));
    expect(r.status).toBe(0);
    const result = JSON.parse(r.stdout);
    expect(result.format).toBe("strutwise.result");
    expect(result.status).toBe("optimal");
    expect(result.objective.final).toBeCloseTo(263.8958, 3); // three-bar test problem, from memory
    expect(r.stderr).toMatch(/iteration +\d+ +objective/);
  });

  it("writes --out and honours --formulation", () => {
    const out = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "sw-opt-")), "r.json");
    const r = run(fx("two-bar-shape.truss.json"), "--formulation", "simultaneous", "--out", out, "--quiet");
    expect(r.status).toBe(0);
    expect(r.stdout).toBe("");
    const result = JSON.parse(fs.readFileSync(out, "utf8"));
    expect(result.formulation).toBe("simultaneous");
    expect(result.variables[0].value).toBeCloseTo(600, 2); // closed form h = b
  });

  it("exits 2 with the validation errors for an invalid model", () => {
    const r = run(fx("broken-references.truss.json"));
    expect(r.status).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toContain('members[0].end: member AB: ends at unknown node "Q"');
    expect(r.stderr).not.toMatch(/\n\s+at /); // no stack trace
  });

  it("exits 2 for a bad option and for a file that is not JSON", () => {
    expect(run(fx("three-bar.truss.json"), "--formulation", "sideways").status).toBe(2);
    const noTime = run(fx("three-bar.truss.json"), "--time-limit", "0");
    expect(noTime.status).toBe(2);
    expect(noTime.stderr).toMatch(/--time-limit must be a positive number of seconds, got "0"/);
    const bad = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "sw-opt-")), "x.truss.json");
    fs.writeFileSync(bad, "{ not json");
    const r = run(bad);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/not valid JSON/);
  });

  it("exits 3 for an infeasible design and 4 when the iteration limit stops it", () => {
    const inf = run(fx("infeasible-bracket.truss.json"), "--quiet");
    expect(inf.status).toBe(3);
    expect(JSON.parse(inf.stdout).status).toBe("infeasible");
    const nc = run(fx("ten-bar.truss.json"), "--max-iterations", "2", "--quiet");
    expect(nc.status).toBe(4);
    expect(JSON.parse(nc.stdout).status).toBe("not-converged");
  });
});
