// `npm start` builds only when build/ is missing or older than a source it is made from.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { buildNeeded } from "../../scripts/start";

let dir: string;
afterEach(() => fs.rmSync(dir, { recursive: true, force: true }));

function write(rel: string, mtimeSeconds: number) {
  const file = path.join(dir, rel);
  fs.mkdirSync(path.dirname(file), { recursive: true });
  fs.writeFileSync(file, "x");
  // folders count too (adding or renaming a file changes its folder), so age them alike
  for (let p = file; p !== dir; p = path.dirname(p)) fs.utimesSync(p, mtimeSeconds, mtimeSeconds);
}

describe("buildNeeded", () => {
  it("asks for a build when there is none", () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), "strutwise-build-"));
    write("app/root.tsx", 1000);
    expect(buildNeeded(dir)).toBe("there is no build yet");
  });

  it("keeps a build newer than every source, and rebuilds after a source changes", () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), "strutwise-build-"));
    write("app/routes/home.tsx", 1000);
    write("vite.config.ts", 1000);
    write("build/client/assets/x.js", 2000);
    write("build/server/index.js", 2000);
    expect(buildNeeded(dir)).toBeNull();
    write("app/routes/home.tsx", 3000);
    expect(buildNeeded(dir)).toBe("app changed since the last build");
  });
});
