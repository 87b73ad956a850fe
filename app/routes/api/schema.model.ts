// GET /api/schema/model.json: the JSON Schema of the model file, for editors that validate
// as one types (public, like the format's documentation).
import { modelJsonSchemaText } from "~/engine/truss/json-schema";
import { withDependencies } from "~/lib/http.server";

let text: string | undefined;

export const loader = withDependencies(async function loader() {
  text ??= modelJsonSchemaText();
  return new Response(text, { headers: { "Content-Type": "application/schema+json; charset=utf-8", "Cache-Control": "public, max-age=300" } });
});
