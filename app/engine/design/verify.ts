// Independent re-analysis of a final design: a fresh stiffness solve at the final areas and
// coordinates (nothing reused from the optimizer's iterates), then every limit of the design
// block, the bounds and equilibrium checked in model units. A reader can trust the result
// without trusting the optimizer.
import { analyze, type Analysis } from "../truss";
import type { Verification, VerificationCheck } from "./result-types";
import type { DesignProblem } from "./problem";
import { memberStress } from "./element";
import { eulerStress } from "./buckling";

/** Relative slack a limit may show in the re-analysis and still count as met. */
export const VERIFY_TOLERANCE = 1e-4;
/** Fresh-solve equilibrium residual |K u - f| / |f| above which the analysis is not trusted. */
export const EQUILIBRIUM_TOLERANCE = 1e-8;

export interface MemberCheck {
  utilization: number;
  governing: string;
  /** the load case or combination of the governing check */
  governingCase: string;
}

export interface Reanalysis {
  analysis: Analysis;
  verification: Verification;
  members: MemberCheck[];
}

export function reanalyze(p: DesignProblem, areas: Float64Array, coords: Float64Array, slack = VERIFY_TOLERANCE): Reanalysis {
  const s = p.structure;
  const m = s.memberIds.length;
  const analysis = analyze(s, { areas, coords });
  const checks: VerificationCheck[] = [];
  const push = (id: string, kind: VerificationCheck["kind"], value: number, limit: number, ratio: number) =>
    checks.push({ id, kind, value, limit, ratio, ok: ratio <= 1 + slack });

  // The stress limits checked are the problem's own (normally the material allowables).
  const stressLimit = new Map<string, number>();
  for (const l of p.limits) {
    if (l.kind === "stress-tension" || l.kind === "stress-compression") stressLimit.set(`${l.member}|${l.loadCase}|${l.sign}`, l.limit);
  }
  const members: MemberCheck[] = [];
  for (let e = 0; e < m; e++) members.push({ utilization: 0, governing: "", governingCase: "" });
  // stress and buckling (and so utilization) read the strength responses: the strength
  // combinations, or every load case when the model has no combinations
  for (const l of p.strengthResponses) {
    const lc = s.responseIds[l];
    const u = analysis.displacements[l];
    for (let e = 0; e < m; e++) {
      const id = s.memberIds[e];
      const sigma = memberStress(s, coords, u, e);
      // Utilization always reads the material allowables, even when the stress limit is off.
      const allow = sigma >= 0 ? s.allowTension[e] : s.allowCompression[e];
      const ratio = Math.abs(sigma) / allow;
      const sign = sigma >= 0 ? 1 : -1;
      const lim = stressLimit.get(`${e}|${l}|${sign}`);
      if (lim !== undefined) push(`stress:${id}:${lc}`, "stress", sigma, sign * lim, Math.abs(sigma) / lim);
      if (ratio > members[e].utilization) members[e] = { utilization: ratio, governing: `stress:${lc}`, governingCase: lc };
      if (p.buckling && sigma < 0) {
        const sigmaE = eulerStress(p.buckling, e, s.E[e], areas[e], analysis.lengths[e]);
        const r = -sigma / sigmaE;
        push(`buckling:${id}:${lc}`, "buckling", sigma, -sigmaE, r);
        if (r > members[e].utilization) members[e] = { utilization: r, governing: `buckling:${lc}`, governingCase: lc };
      }
    }
  }
  const seen = new Set<string>();
  for (const lim of p.limits) {
    if (lim.kind === "displacement" && !seen.has(lim.id)) {
      seen.add(lim.id);
      const v = analysis.displacements[lim.loadCase][lim.dof];
      push(lim.id, "displacement", v, lim.limit, Math.abs(v) / lim.limit);
    } else if (lim.kind === "volume") {
      push("volume", "volume", analysis.volume, lim.limit, analysis.volume / lim.limit);
    } else if (lim.kind === "length") {
      const L = analysis.lengths[lim.member];
      push(lim.id, "bounds", L, lim.limit, lim.limit / L);
    }
  }
  for (const v of p.areaVars) {
    const A = areas[v.members[0]];
    push(`area-min:${v.id}`, "bounds", A, v.min, v.min / A);
    push(`area-max:${v.id}`, "bounds", A, v.max, A / v.max);
  }
  push("equilibrium", "equilibrium", analysis.equilibriumResidual, EQUILIBRIUM_TOLERANCE,
    analysis.equilibriumResidual / EQUILIBRIUM_TOLERANCE);

  const failures = checks.filter((c) => !c.ok);
  const limitChecks = checks.filter((c) => c.kind !== "equilibrium" && c.kind !== "bounds");
  const worst = [...limitChecks].sort((a, b) => b.ratio - a.ratio).slice(0, 10);
  const maxUtilization = members.reduce((mx, c) => Math.max(mx, c.utilization), 0);
  return {
    analysis,
    members,
    verification: {
      equilibriumResidual: analysis.equilibriumResidual,
      maxUtilization,
      allLimitsMet: failures.length === 0,
      checked: checks.length,
      failures,
      worst,
    },
  };
}
