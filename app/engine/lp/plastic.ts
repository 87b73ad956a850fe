// The plastic (limit) design linear program of a pin-jointed truss:
//
//   minimize    sum_v c_v A_v                      c_v = sum over the members of area variable v of rho_e L_e
//   subject to  B q_k - s_k G A = f_k               equilibrium at every free dof, every checked case k
//               -sigma_c,e A_v(e) <= q_ek <= sigma_t,e A_v(e)
//               A_v >= 0
//
// over member forces q (tension positive) and areas A. It drops compatibility (the forces need
// not come from one displacement field), so every elastic design that carries the same cases
// within the same allowables is a feasible point: its optimum is a lower bound on the mass of any
// such design on these nodes and members. Own weight (s_k times the members' weight G A, half to
// each end node, along -y in 2D and -z in 3D) is linear in the areas, so it stays an LP.
//
// The LP is solved in scaled units (forces by the largest load, areas by that load over the
// largest allowable, costs by the largest cost) so the solver's absolute tolerances mean the
// same thing in mm/N/t as in ft/kip/lb.
import type { LpSolver } from "./solver";
import type { PlasticDesignInput } from "./plastic-input";
import { buildLp } from "./plastic-lp";

export type { PlasticCase, PlasticDesignInput } from "./plastic-input";

export type PlasticDesign =
  | {
      status: "optimal";
      mass: number; // model mass units
      varAreas: Float64Array; // per area variable
      memberAreas: Float64Array; // per member
      forces: Float64Array[]; // per case, per member; tension positive
      solver: string;
    }
  | { status: "infeasible" | "failed"; message: string; cases: string[]; solver: string };

const AXES = ["x", "y", "z"];

/** Solves the plastic-design LP; infeasibility and solver trouble come back in words, never thrown. */
export function solvePlasticDesign(input: PlasticDesignInput, solver: LpSolver, options: { timeLimitS?: number } = {}): PlasticDesign {
  const solverName = `${solver.name} ${solver.version}`;
  const unreachable = unreachableLoads(input);
  if (unreachable.length > 0) {
    return { status: "infeasible", message: unreachable.map((u) => u.sentence).join(" "), cases: [...new Set(unreachable.map((u) => u.caseId))], solver: solverName };
  }
  const built = buildLp(input);
  const sol = solver.solve(built.lp, options);
  if (sol.status === "optimal") {
    const { varAreas, memberAreas, forces } = built.unscale(sol.x);
    return { status: "optimal", mass: sol.objective * built.objectiveScale, varAreas, memberAreas, forces, solver: solverName };
  }
  if (sol.status === "failed") {
    return { status: "failed", message: `The LP solver did not finish: ${sol.detail}.`, cases: [], solver: solverName };
  }
  // The objective is a sum of non-negative costs times non-negative areas, so the LP cannot be
  // unbounded: any other outcome means no set of forces within the allowables balances some case.
  // Solving the cases one at a time names them.
  const failing =
    input.cases.length === 1
      ? [input.cases[0].id]
      : input.cases.filter((c) => solver.solve(buildLp({ ...input, cases: [c] }).lp, options).status !== "optimal").map((c) => c.id);
  const named = failing.length > 0 ? failing : input.cases.map((c) => c.id);
  return {
    status: "infeasible",
    message:
      `No member forces within the allowable stresses balance ${listCases(named)}, whatever the areas: ` +
      "the members cannot carry the load in some direction (a missing member or support, or an allowable of zero on the side the load needs).",
    cases: named,
    solver: solverName,
  };
}

function listCases(ids: string[]): string {
  return ids.length === 1 ? `case ${ids[0]}` : `cases ${ids.join(", ")}`;
}

/** Loads on free directions no member reaches: infeasible before any LP, and easy to name. */
function unreachableLoads(input: PlasticDesignInput): { caseId: string; sentence: string }[] {
  const reach = memberReach(input);
  const out: { caseId: string; sentence: string }[] = [];
  for (const c of input.cases) {
    let scale = 0;
    for (const v of c.loads) scale = Math.max(scale, Math.abs(v));
    for (let d = 0; d < c.loads.length; d++) {
      if (input.fixed[d] || Math.abs(c.loads[d]) <= 1e-12 * scale || reach[d]) continue;
      const node = input.nodeIds[Math.floor(d / 3)];
      out.push({ caseId: c.id, sentence: `Case ${c.id} loads node ${node} along ${AXES[d % 3]}, but no member reaches ${node} in that direction, so no truss on these members can carry it.` });
      if (out.length >= 5) return out;
    }
  }
  return out;
}

/** 1 for each dof that some member has a non-zero direction component along. */
function memberReach(input: PlasticDesignInput): Uint8Array {
  const reach = new Uint8Array(input.coords.length);
  const { coords, start, end } = input;
  for (let e = 0; e < start.length; e++) {
    const i = 3 * start[e], j = 3 * end[e];
    const d = [coords[j] - coords[i], coords[j + 1] - coords[i + 1], coords[j + 2] - coords[i + 2]];
    const L = Math.hypot(d[0], d[1], d[2]);
    for (let a = 0; a < 3; a++) {
      if (Math.abs(d[a]) > 1e-9 * L) {
        reach[i + a] = 1;
        reach[j + a] = 1;
      }
    }
  }
  return reach;
}
