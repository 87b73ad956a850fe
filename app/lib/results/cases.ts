// The load cases and combinations of a result, in one list: what every picker, table, CSV and
// report section offers. Pure and isomorphic (pages, CSV and PDF share it).
import type { ResultMember, TrussResult } from "~/engine/design/result-types";

export interface ResultCase {
  id: string;
  name?: string;
  kind: "load case" | "combination";
  use?: "strength" | "service";
  selfWeight?: number;
  factors?: Record<string, number>;
}

/** Load cases first (as the model lists them), then combinations. */
export function resultCases(result: Pick<TrussResult, "loadCases" | "combinations" | "members" | "nodes">): ResultCase[] {
  const cases: ResultCase[] = (result.loadCases ?? []).map((l) => ({ id: l.id, name: l.name, kind: "load case", ...(l.selfWeight ? { selfWeight: l.selfWeight } : {}) }));
  const combos: ResultCase[] = (result.combinations ?? []).map((c) => ({ id: c.id, name: c.name, kind: "combination", use: c.use, factors: c.factors }));
  if (cases.length === 0) {
    // an older result without its list: the keys of the force maps, minus known combinations
    const known = new Set(combos.map((c) => c.id));
    const keys = Object.keys(result.members[0]?.force ?? result.nodes[0]?.displacement ?? {});
    for (const k of keys) if (!known.has(k)) cases.push({ id: k, kind: "load case" });
  }
  return [...cases, ...combos];
}

/** The case a page opens on: the first strength combination when there are combinations (those carry the limits), else the first case. */
export function defaultCaseId(cases: ResultCase[]): string {
  return (cases.find((c) => c.use === "strength") ?? cases.find((c) => c.kind === "combination") ?? cases[0])?.id ?? "";
}

/** "ULS-1 — Strength: own weight + snow" plus what kind of case it is, for pickers. */
export function caseLabel(c: ResultCase): string {
  const kind = c.kind === "combination" ? `${c.use ?? ""} combination`.trim() : c.selfWeight ? `load case with own weight ×${c.selfWeight}` : "load case";
  return `${c.id}${c.name ? ` — ${c.name}` : ""} (${kind})`;
}

/** "1.35 × G + 1.5 × S" */
export function factorsText(factors: Record<string, number> | undefined): string {
  return Object.entries(factors ?? {})
    .map(([id, f]) => `${f} × ${id}`)
    .join(" + ");
}

/**
 * The load case or combination that governs a member: the result's own field, else read from
 * the governing check's id ("stress:ULS-1" → "ULS-1").
 */
export function governingCaseOf(m: Pick<ResultMember, "governing" | "governingCase">, caseIds: string[]): string | undefined {
  if (m.governingCase) return m.governingCase;
  const g = m.governing;
  if (!g) return undefined;
  return caseIds.find((id) => g === id || g.endsWith(`:${id}`));
}

// the rule for naming a case lives beside the constraint words it serves
export { caseWords, type NamedCases } from "~/engine/design/constraint-words";
