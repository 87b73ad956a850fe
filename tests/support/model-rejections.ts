// Edit a valid model, parse it, and read the refusal: shared by the tests of the format's rules.
import { expect } from "vitest";
import { parseModel, type ModelIssue } from "~/engine/truss";

export function rejections<M>(base: () => M) {
  function errorsOf(edit: (m: M) => void): ModelIssue[] {
    const m = base();
    edit(m);
    const r = parseModel(m);
    if (r.ok) throw new Error("expected the model to be rejected");
    return r.errors;
  }
  function expectError(edit: (m: M) => void, path: string, words: RegExp) {
    const errs = errorsOf(edit);
    const hit = errs.find((e) => e.path === path && words.test(e.message));
    expect(hit, `no error at ${path} matching ${words}; got ${JSON.stringify(errs)}`).toBeDefined();
  }
  return { errorsOf, expectError };
}
