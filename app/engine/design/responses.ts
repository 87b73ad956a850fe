// Per-response result fields (docs/model-format.md): the force, stress and
// displacement maps over every load case and combination, the support reactions, and the
// check that the reactions balance the applied loads and own weight. Shared by design results
// and analysis-only results.
import type { Analysis, Structure } from "../truss";
import type { ReactionBalance, ResultCombination, ResultReaction } from "./result-types";

type Triple = [number, number, number];

/** id -> value over every response (load cases, then combinations). */
export function perResponse<T>(s: Structure, f: (r: number) => T): Record<string, T> {
  const out: Record<string, T> = {};
  s.responseIds.forEach((id, r) => (out[id] = f(r)));
  return out;
}

export function memberForceMap(s: Structure, a: Analysis, e: number): Record<string, number> {
  return perResponse(s, (r) => a.forces[r][e]);
}

export function memberStressMap(s: Structure, a: Analysis, e: number): Record<string, number> {
  return perResponse(s, (r) => a.stresses[r][e]);
}

export function nodeDisplacementMap(s: Structure, a: Analysis, i: number): Record<string, Triple> {
  return perResponse(s, (r) => [a.displacements[r][3 * i], a.displacements[r][3 * i + 1], a.displacements[r][3 * i + 2]]);
}

/** Every supported node (a restrained axis other than the z that 2D restrains for itself). */
export function reactions(s: Structure, a: Analysis): ResultReaction[] {
  const out: ResultReaction[] = [];
  for (let i = 0; i < s.nodeIds.length; i++) {
    let supported = false;
    for (let c = 0; c < s.dim; c++) if (s.fixed[3 * i + c]) supported = true;
    if (!supported) continue;
    // the 2D z dof is restrained by the model's dimension, not by a support: report 0
    const values = perResponse(s, (r): Triple => [a.reactions[r][3 * i], a.reactions[r][3 * i + 1], s.dim === 3 ? a.reactions[r][3 * i + 2] : 0]);
    out.push({ node: s.nodeIds[i], values });
  }
  return out;
}

/** Totals of applied load and reaction per response; they should cancel. */
export function reactionBalance(s: Structure, a: Analysis): ReactionBalance[] {
  return s.responseIds.map((id, r) => {
    const applied: Triple = [0, 0, 0];
    const total: Triple = [0, 0, 0];
    for (let i = 0; i < s.nodeIds.length; i++) {
      for (let c = 0; c < 3; c++) {
        applied[c] += a.loads[r][3 * i + c];
        total[c] += a.reactions[r][3 * i + c];
      }
    }
    // loads on nodes no member connects do not reach the supports; the model warns about them
    const scale = Math.max(Math.abs(applied[0]), Math.abs(applied[1]), Math.abs(applied[2]));
    const miss = Math.max(...applied.map((v, c) => Math.abs(v + total[c])));
    return { id, applied, reactions: total, residual: scale > 0 ? miss / scale : miss };
  });
}

export function resultCombinations(s: Structure): ResultCombination[] {
  return s.combinations.map((c) => {
    const factors: Record<string, number> = {};
    c.factors.forEach((f, l) => {
      if (f !== 0) factors[s.loadCaseIds[l]] = f;
    });
    return { id: c.id, ...(c.name ? { name: c.name } : {}), use: c.use, factors };
  });
}
