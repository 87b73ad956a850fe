// `node scripts/run-tool.mjs <tool> [args...]`: runs a command-line tool from its precompiled
// bundle (scripts/tools-bundle.mjs), bundling it first when a source changed since. The
// tool reads its own arguments from process.argv, which is left as node would give it.
import { pathToFileURL } from "node:url";
import v8 from "node:v8";
import { TOOL_ENTRIES, ensureToolsBundle, toolFile } from "./tools-bundle.mjs";

/** Bytecode a function may run before V8 considers optimizing it, in the tools (default 67,584). */
const TOOL_INTERRUPT_BUDGET = 200000;

// A tool is a short process. V8's default budget (67,584 bytecode units) sends the solver's
// functions to its optimizing compiler within the first milliseconds, and on a small model that
// compiling costs more CPU than it saves; a larger budget leaves the optimizing to what keeps
// running (CPU of the solve, best of 2, load 15-18 on 2 cores: ten-bar, six starts 0.30-0.34 s
// -> 0.18-0.20 s; 109 members, one start 0.35 -> 0.32 s; 419 members 1.0 -> 0.92-0.95 s).
// Set before the tool's code loads, so every function of it (and of its solver threads) runs on it.
v8.setFlagsFromString(`--interrupt-budget=${TOOL_INTERRUPT_BUDGET}`);
// The LP runtime (HiGHS, 3.5 MB of WebAssembly) is compiled by V8's baseline compiler only. By
// default V8 recompiles its hot functions with the optimizing compiler in background threads,
// and node waits for those jobs before the process may exit: a tool that solved a few small
// LPs then sat idle for 0.1-0.2 s (109-member least-compliance run, whole process 0.52-0.59 s
// -> 0.38-0.41 s, CPU 0.78 -> 0.51 s). Even the one interior-point LP of a 2,560-member layout
// is quicker to its answer this way (first solve 361 -> 181 ms); only repeated large solves,
// which a tool never makes, would gain from the optimized code. The web worker's long-lived
// threads keep V8's default.
v8.setFlagsFromString("--liftoff-only");

const [, , tool, ...rest] = process.argv;
if (!tool || !(tool in TOOL_ENTRIES)) {
  process.stderr.write(`usage: node scripts/run-tool.mjs <${Object.keys(TOOL_ENTRIES).join("|")}> [arguments]\n`);
  process.exit(1);
}
const why = await ensureToolsBundle();
if (why && process.env.STRUTWISE_QUIET_BUNDLE !== "1") process.stderr.write(`(bundled the tools: ${why})\n`);
process.argv = [process.argv[0], toolFile(tool), ...rest];
await import(pathToFileURL(toolFile(tool)).href);
