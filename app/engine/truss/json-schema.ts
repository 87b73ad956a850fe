// The JSON Schema of the model file, generated from the zod schema (the one gate), so editors
// can validate a file as it is typed. Committed as docs/model.schema.json (a test keeps it
// fresh: `npm run schema` rewrites it) and served at /api/schema/model.json. Cross-reference
// rules (unknown ids, mechanisms) are beyond a JSON Schema; the upload reports those.
import { z } from "zod";
import { trussModelSchema } from "./schema";

export const MODEL_SCHEMA_ID = "/api/schema/model.json";

export function modelJsonSchema(): Record<string, unknown> {
  const schema = z.toJSONSchema(trussModelSchema, { io: "input", unrepresentable: "any" }) as Record<string, unknown>;
  return {
    ...schema,
    $id: MODEL_SCHEMA_ID,
    title: "Strutwise truss model, version 1",
    description: "A truss model file (*.truss.json); reference: docs/model-format.md in the Strutwise repository.",
  };
}

/** The committed file's text: two-space indentation and a final newline. */
export function modelJsonSchemaText(): string {
  return `${JSON.stringify(modelJsonSchema(), null, 2)}\n`;
}
