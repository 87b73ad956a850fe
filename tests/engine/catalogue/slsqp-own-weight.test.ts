// Cross-check against scipy.optimize SLSQP (Debian's python3-scipy, a general-purpose reference
// library): a Pratt girder sized for least mass with own weight and load combinations, solved
// by tests/python/slsqp_truss.py (its own analysis, own-weight load and adjoint gradients in
// numpy). Without scipy the check is skipped with a loud message.
import { describe, expect, it } from "vitest";
import { buildStructure, parseModel, type TrussModelInput } from "~/engine/truss";
import { optimizeModel } from "~/engine/design";
import { buildDesignProblem } from "~/engine/design/problem";
import { nestedFormulation } from "~/engine/design/nested";
import { runSlsqp, scipyPython } from "../design/slsqp-reference";
import { steelModelHeader } from "../../support/model-header";

const hasScipy = scipyPython() !== null;
if (!hasScipy) {
  console.warn("\n!!!!!!!! python3-scipy NOT FOUND: the SLSQP cross-check with own weight and combinations is SKIPPED !!!!!!!!\n");
}

/** Pratt girder (invented: the Brackwater service gantry), bays x 3 m, depth 2.5 m, pinned and on a roller. */
function girder(bays: number): TrussModelInput {
  const nodes: TrussModelInput["nodes"] = [];
  for (let i = 0; i <= bays; i++) {
    nodes.push({ id: `B${i}`, x: 3000 * i, y: 0, ...(i === 0 ? { fixed: ["x", "y"] as ("x" | "y")[] } : i === bays ? { fixed: ["y"] as "y"[] } : {}) });
    nodes.push({ id: `T${i}`, x: 3000 * i, y: 2500 });
  }
  const members: TrussModelInput["members"] = [];
  const add = (a: string, b: string, group?: string) => members.push({ id: `${a}${b}`, start: a, end: b, material: "steel", area: 1500, ...(group ? { group } : {}) });
  for (let i = 0; i < bays; i++) {
    add(`B${i}`, `B${i + 1}`);
    add(`T${i}`, `T${i + 1}`);
    add(i < bays / 2 ? `T${i}` : `B${i}`, i < bays / 2 ? `B${i + 1}` : `T${i + 1}`);
  }
  for (let i = 0; i <= bays; i++) add(`B${i}`, `T${i}`, "posts");
  const deck = Array.from({ length: bays - 1 }, (_, i) => ({ node: `B${i + 1}`, fy: -30000 }));
  const side = Array.from({ length: bays + 1 }, (_, i) => ({ node: `T${i}`, fx: 4000 }));
  const m = steelModelHeader("Brackwater service gantry (invented)", 2, { tension: 235, compression: 160 });
  m.materials[0].density = 7.85e-8; // ten times steel, so own weight shapes the design
  return {
    ...m,
    nodes,
    members,
    loadCases: [
      { id: "G", name: "Own weight", selfWeight: 1, loads: [] },
      { id: "Q", name: "Deck load", loads: deck },
      { id: "W", name: "Side wind", loads: side },
    ],
    combinations: [
      { id: "STR-1", use: "strength", factors: { G: 1.35, Q: 1.5, W: 0.9 } },
      { id: "STR-2", use: "strength", factors: { G: 1.0, W: 1.5 } },
      { id: "SRV-1", use: "service", factors: { G: 1, Q: 1 } },
    ],
    design: {
      objective: "mass",
      areaBounds: { min: 50, max: 20000 },
      constraints: { stress: true, displacement: [{ node: `B${bays / 2}`, axis: "y", limit: (3000 * bays) / 400 }] },
      solver: { tolerance: 1e-8 },
    },
  };
}

describe.skipIf(!hasScipy)("design optimum equals scipy SLSQP with own weight and combinations", () => {
  it("Pratt girder, 6 bays, 25 members, stress on two strength combinations, deflection on a service one", () => {
    const parsed = parseModel(girder(6));
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors));
    const model = parsed.model;
    const p = buildDesignProblem(model, buildStructure(model), {});
    const ref = runSlsqp(p, nestedFormulation(p).objectiveScale, { maxiter: 1000 })!;
    expect(ref.success, ref.message).toBe(true);
    for (const formulation of ["nested", "simultaneous"] as const) {
      const r = optimizeModel(model, { formulation });
      expect(r.verification!.allLimitsMet).toBe(true);
      expect(r.status, r.message).toBe("optimal");
      expect(Math.abs(r.objective.final - ref.f) / ref.f, `${formulation}: ${r.objective.final} vs SLSQP ${ref.f}`).toBeLessThan(1e-4);
    }
  });
});
