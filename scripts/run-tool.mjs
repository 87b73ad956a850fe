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

const [, , tool, ...rest] = process.argv;
if (!tool || !(tool in TOOL_ENTRIES)) {
  process.stderr.write(`usage: node scripts/run-tool.mjs <${Object.keys(TOOL_ENTRIES).join("|")}> [arguments]\n`);
  process.exit(1);
}
const why = await ensureToolsBundle();
if (why && process.env.STRUTWISE_QUIET_BUNDLE !== "1") process.stderr.write(`(bundled the tools: ${why})\n`);
process.argv = [process.argv[0], toolFile(tool), ...rest];
await import(pathToFileURL(toolFile(tool)).href);
