// `npm run -s analyze -- path/model.truss.json [--compact]`
// Prints the analysis (docs/model-format.md result field names) as JSON on stdout.
// Exit codes: 0 done, 2 invalid model (validation errors or the mechanism on stderr), 1 unreadable file or usage.
import fs from "node:fs";
import { analyzeModelToJson, MechanismError, parseModelText } from "../app/engine/truss";

const USAGE = "usage: npm run -s analyze -- path/model.truss.json [--compact]";

function fail(code: number, lines: string[]): never {
  for (const l of lines) process.stderr.write(`${l}\n`);
  process.exit(code);
}

const args = process.argv.slice(2);
const compact = args.includes("--compact");
const files = args.filter((a) => !a.startsWith("--"));
if (files.length !== 1) fail(1, [USAGE]);
const file = files[0];

let text: string;
try {
  text = fs.readFileSync(file, "utf8");
} catch (e) {
  const code = (e as NodeJS.ErrnoException).code;
  fail(1, [`cannot read ${file}: ${code === "ENOENT" ? "no such file" : code === "EISDIR" ? "it is a folder" : code === "EACCES" ? "permission denied" : String((e as Error).message)}`]);
}

const parsed = parseModelText(text);
for (const w of parsed.warnings) process.stderr.write(`warning: ${w.path ? `${w.path}: ` : ""}${w.message}\n`);
if (!parsed.ok) fail(2, [`${file}: the model is not valid (${parsed.errors.length} error${parsed.errors.length === 1 ? "" : "s"}):`, ...parsed.errors.map((e) => `  ${e.path ? `${e.path}: ` : ""}${e.message}`)]);

try {
  const report = analyzeModelToJson(parsed.model);
  process.stdout.write(`${JSON.stringify(report, null, compact ? 0 : 2)}\n`);
} catch (e) {
  if (e instanceof MechanismError) fail(2, [`${file}: ${e.message}`]);
  fail(1, [`${file}: analysis failed: ${e instanceof Error ? e.message : String(e)}`]);
}
