// The command-line tools and the solver threads run precompiled JavaScript: esbuild bundles
// each entry below into build/tools/ (at `npm run build`, and again by scripts/run-tool.mjs
// whenever a source it was made from is newer than the bundle). Compiling TypeScript at every
// launch cost 1-2 s per command; a fresh bundle starts in node's own time.
//
// Plain JavaScript on purpose: the launcher must not need the TypeScript loader it avoids.
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");

/** Bundled entries: name -> source file (relative to the repository root). */
export const TOOL_ENTRIES = {
  optimize: "scripts/optimize.ts",
  analyze: "scripts/analyze.ts",
  "solve-task": "workers/solve-task.ts",
  "start-task": "workers/start-task.ts",
  "web-task": "workers/web-task.ts",
};

/**
 * Packages bundled into the tools with our own sources: pure JavaScript, loaded at every launch
 * and in every solver thread, where node's resolution and loading of their many files (zod) or
 * its scan of a CommonJS file (ml-matrix) cost more than the solve of a small model. Every other
 * package stays external, resolved by node from node_modules: those with files of their own
 * beside their code (the HiGHS WebAssembly) or native parts (the database client).
 */
const BUNDLED_PACKAGES = ["zod", "ml-matrix", "d3-scale"];

/** Files that change every bundle without being one of its inputs. */
const BUILD_SETTINGS = ["package.json", "package-lock.json", "tsconfig.json", "scripts/tools-bundle.mjs"];

/** @param {string} dir */
export function toolsDir(dir = root) {
  return path.join(dir, "build/tools");
}

/** @param {string} name @param {string} dir */
export function toolFile(name, dir = root) {
  return path.join(toolsDir(dir), `${name}.mjs`);
}

/**
 * Why the bundles must be made again, or null when every bundle is newer than every source
 * esbuild read for it (the list it wrote beside them) and than the build settings.
 * @param {string} dir
 * @returns {string | null}
 */
export function bundleNeeded(dir = root) {
  const inputsFile = path.join(toolsDir(dir), "inputs.json");
  if (!fs.existsSync(inputsFile)) return "there is no tools bundle yet";
  /** @type {{ inputs: string[], entries: string[] }} */
  let recorded;
  try {
    recorded = JSON.parse(fs.readFileSync(inputsFile, "utf8"));
  } catch {
    return "the bundle's input list is unreadable";
  }
  const wanted = Object.keys(TOOL_ENTRIES).sort().join(",");
  if (recorded.entries.slice().sort().join(",") !== wanted) return "the list of tools changed";
  let built = Infinity;
  for (const name of Object.keys(TOOL_ENTRIES)) {
    const file = toolFile(name, dir);
    if (!fs.existsSync(file)) return `${name} is not bundled yet`;
    built = Math.min(built, fs.statSync(file).mtimeMs);
  }
  for (const rel of [...BUILD_SETTINGS, ...recorded.inputs]) {
    const file = path.join(dir, rel);
    // a deleted source changes the bundle too (an import now points elsewhere)
    if (!fs.existsSync(file)) return `${rel} is gone since the last bundle`;
    if (fs.statSync(file).mtimeMs > built) return `${rel} changed since the last bundle`;
  }
  return null;
}

/**
 * Bundles every tool into build/tools/ (ES modules; packages stay external, so node resolves
 * them from node_modules as before) and records the sources read.
 * @param {string} dir
 */
export async function bundleTools(dir = root) {
  const esbuild = await import("esbuild");
  const out = toolsDir(dir);
  fs.mkdirSync(out, { recursive: true });
  const result = await esbuild.build({
    absWorkingDir: dir,
    entryPoints: Object.fromEntries(Object.entries(TOOL_ENTRIES).map(([name, src]) => [name, path.join(dir, src)])),
    outdir: out,
    outExtension: { ".js": ".mjs" },
    bundle: true,
    // shared engine code lands in one chunk; a tool loads it only when it needs it
    splitting: true,
    chunkNames: "chunks/[name]-[hash]",
    format: "esm",
    platform: "node",
    target: "node20",
    plugins: [packagesExternalExcept(BUNDLED_PACKAGES)],
    sourcemap: "linked",
    metafile: true,
    write: false,
    logLevel: "silent",
    tsconfig: path.join(dir, "tsconfig.json"),
  });
  // each file through a temporary name and a rename: two launchers bundling at once, or a
  // tool starting while another bundles, never read half a file (chunk names carry a hash of
  // their content, so a chunk an older entry still imports stays valid)
  for (const file of result.outputFiles) {
    fs.mkdirSync(path.dirname(file.path), { recursive: true });
    const tmp = `${file.path}.${process.pid}.tmp`;
    fs.writeFileSync(tmp, file.contents);
    fs.renameSync(tmp, file.path);
  }
  removeStaleChunks(out, result.outputFiles.map((f) => f.path));
  const inputs = Object.keys(result.metafile.inputs).filter((f) => !f.includes("node_modules"));
  // written last, so a bundle cut short is seen as missing
  const list = path.join(out, `inputs.json.${process.pid}.tmp`);
  fs.writeFileSync(list, JSON.stringify({ entries: Object.keys(TOOL_ENTRIES), inputs }, null, 1));
  fs.renameSync(list, path.join(out, "inputs.json"));
}

/** A chunk no bundle has written for this long is no longer imported by any running tool. */
export const STALE_CHUNK_MS = 24 * 3600 * 1000;

/**
 * Deletes chunks (and their maps) that the bundle just written does not contain and that are
 * older than STALE_CHUNK_MS. Younger ones stay: a tool started before the bundle was remade
 * may still load one of its chunks lazily (the LP runtime's, after a long solve).
 * @param {string} out
 * @param {string[]} written
 */
export function removeStaleChunks(out, written) {
  const keep = new Set(written.map((f) => path.resolve(f)));
  const chunks = path.join(out, "chunks");
  if (!fs.existsSync(chunks)) return;
  const now = Date.now();
  for (const name of fs.readdirSync(chunks)) {
    const file = path.resolve(chunks, name);
    if (keep.has(file)) continue;
    try {
      if (now - fs.statSync(file).mtimeMs > STALE_CHUNK_MS) fs.rmSync(file, { force: true });
    } catch {
      // another bundler removed it first
    }
  }
}

/**
 * esbuild's `packages: "external"` with exceptions: a bare import in our sources of a package
 * not in `bundled` (or of one of its files) is left to node; the bundled ones bring their own
 * dependencies along.
 * @param {string[]} bundled
 * @returns {import("esbuild").Plugin}
 */
function packagesExternalExcept(bundled) {
  return {
    name: "packages-external-except",
    setup(build) {
      build.onResolve({ filter: /^[^./~]/ }, (args) => {
        if (args.path.startsWith("node:")) return { path: args.path, external: true };
        // an import inside a bundled package: its dependencies come along
        if (args.importer.includes(`${path.sep}node_modules${path.sep}`)) return undefined;
        const name = args.path.startsWith("@") ? args.path.split("/").slice(0, 2).join("/") : args.path.split("/")[0];
        return bundled.includes(name) ? undefined : { path: args.path, external: true };
      });
    },
  };
}

/**
 * Bundles when needed; returns what was done, for a log line.
 * @param {string} dir
 */
export async function ensureToolsBundle(dir = root) {
  const why = bundleNeeded(dir);
  if (!why) return null;
  await bundleTools(dir);
  return why;
}

// `node scripts/tools-bundle.mjs`: bundle now (part of `npm run build`)
if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  await bundleTools();
  process.stdout.write(`tools bundled into ${path.relative(process.cwd(), toolsDir()) || "."}\n`);
}
