// The command-line tools and solver threads run a bundle that is made again only when a
// source it was made from (esbuild's own list of inputs) or a build setting changed.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { STALE_CHUNK_MS, TOOL_ENTRIES, bundleNeeded, removeStaleChunks, root } from "../../scripts/tools-bundle.mjs";

let dir: string;
afterEach(() => fs.rmSync(dir, { recursive: true, force: true }));

function write(rel: string, mtimeSeconds: number, text = "x") {
  const file = path.join(dir, rel);
  fs.mkdirSync(path.dirname(file), { recursive: true });
  fs.writeFileSync(file, text);
  fs.utimesSync(file, mtimeSeconds, mtimeSeconds);
}

function fakeBundle(inputs: string[], mtimeSeconds: number) {
  for (const name of Object.keys(TOOL_ENTRIES)) write(`build/tools/${name}.mjs`, mtimeSeconds);
  write("build/tools/inputs.json", mtimeSeconds, JSON.stringify({ entries: Object.keys(TOOL_ENTRIES), inputs }));
}

describe("bundleNeeded", () => {
  it("asks for a bundle when there is none", () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), "strutwise-tools-"));
    expect(bundleNeeded(dir)).toBe("there is no tools bundle yet");
  });

  it("keeps a bundle newer than its inputs, and bundles again after one changes or goes", () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), "strutwise-tools-"));
    for (const f of ["package.json", "package-lock.json", "tsconfig.json", "scripts/tools-bundle.mjs", "app/engine/sqp/minimize.ts", "scripts/optimize.ts"]) write(f, 1000);
    fakeBundle(["app/engine/sqp/minimize.ts", "scripts/optimize.ts"], 2000);
    expect(bundleNeeded(dir)).toBeNull();
    // a source outside the bundle's inputs does not matter
    write("app/routes/home.tsx", 3000);
    expect(bundleNeeded(dir)).toBeNull();
    write("app/engine/sqp/minimize.ts", 3000);
    expect(bundleNeeded(dir)).toBe("app/engine/sqp/minimize.ts changed since the last bundle");
    fakeBundle(["app/engine/sqp/minimize.ts", "scripts/optimize.ts"], 4000);
    fs.rmSync(path.join(dir, "scripts/optimize.ts"));
    expect(bundleNeeded(dir)).toBe("scripts/optimize.ts is gone since the last bundle");
  });

  it("bundles again when the tool list changed or a settings file is newer", () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), "strutwise-tools-"));
    for (const f of ["package.json", "package-lock.json", "tsconfig.json", "scripts/tools-bundle.mjs"]) write(f, 1000);
    fakeBundle([], 2000);
    write("package-lock.json", 3000);
    expect(bundleNeeded(dir)).toBe("package-lock.json changed since the last bundle");
    write("build/tools/inputs.json", 4000, JSON.stringify({ entries: ["optimize"], inputs: [] }));
    expect(bundleNeeded(dir)).toBe("the list of tools changed");
  });
});

describe("removeStaleChunks", () => {
  it("deletes chunks the new bundle lacks once they are a day old, and keeps younger ones for tools still running", () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), "strutwise-tools-"));
    const now = Date.now() / 1000;
    const old = now - (STALE_CHUNK_MS / 1000 + 60);
    write("build/tools/chunks/chunk-OLD.mjs", old);
    write("build/tools/chunks/chunk-OLD.mjs.map", old);
    write("build/tools/chunks/chunk-YOUNG.mjs", now - 60);
    write("build/tools/chunks/chunk-WRITTEN.mjs", old);
    const out = path.join(dir, "build/tools");
    removeStaleChunks(out, [path.join(out, "chunks/chunk-WRITTEN.mjs"), path.join(out, "optimize.mjs")]);
    expect(fs.readdirSync(path.join(out, "chunks")).sort()).toEqual(["chunk-WRITTEN.mjs", "chunk-YOUNG.mjs"]);
  });
});

describe("run-tool launcher", () => {
  it("answers --help from the bundle, making it first if needed", () => {
    const r = spawnSync(process.execPath, [path.join(root, "scripts/run-tool.mjs"), "optimize", "--help"], { cwd: root, encoding: "utf8" });
    expect(r.status).toBe(0);
    expect(r.stderr).toMatch(/usage: npm run -s optimize -- model\.truss\.json/);
    expect(bundleNeeded(root)).toBeNull();
  });

  it("names the tools it knows when given another", () => {
    const r = spawnSync(process.execPath, [path.join(root, "scripts/run-tool.mjs"), "nonesuch"], { cwd: root, encoding: "utf8" });
    expect(r.status).toBe(1);
    expect(r.stderr).toContain("optimize|analyze");
  });
});
