// `node scripts/run-tool.mjs <tool> [args...]`: runs a command-line tool from its precompiled
// bundle (scripts/tools-bundle.mjs), bundling it first when a source changed since. The
// tool reads its own arguments from process.argv, which is left as node would give it.
import { pathToFileURL } from "node:url";
import { TOOL_ENTRIES, ensureToolsBundle, toolFile } from "./tools-bundle.mjs";

const [, , tool, ...rest] = process.argv;
if (!tool || !(tool in TOOL_ENTRIES)) {
  process.stderr.write(`usage: node scripts/run-tool.mjs <${Object.keys(TOOL_ENTRIES).join("|")}> [arguments]\n`);
  process.exit(1);
}
const why = await ensureToolsBundle();
if (why && process.env.STRUTWISE_QUIET_BUNDLE !== "1") process.stderr.write(`(bundled the tools: ${why})\n`);
process.argv = [process.argv[0], toolFile(tool), ...rest];
await import(pathToFileURL(toolFile(tool)).href);
