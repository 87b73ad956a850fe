// Writes docs/model.schema.json from the zod schema (npm run schema); a test fails while the
// committed file differs from what this writes.
import fs from "node:fs";
import path from "node:path";
import { modelJsonSchemaText } from "~/engine/truss/json-schema";

const file = path.resolve(process.cwd(), "docs/model.schema.json");
fs.writeFileSync(file, modelJsonSchemaText());
console.log(`wrote ${path.relative(process.cwd(), file)}`);
