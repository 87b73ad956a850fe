// Section 2, the design problem as posed: objective, formulation, variables with their
// bounds, the limits, the solver settings and the options the job overrode.
import { formatNumber } from "~/lib/format";
import type { ReportWriter } from "./layout";
import { INK_MUTED } from "./palette";
import type { ModelFile, ReportData } from "./report-data";
import { table } from "./tables";
import { unitLabels } from "./units";

export interface AreaVariable {
  id: string;
  members: string[];
  min: number;
  max: number;
  initial: number;
}

/** Members sharing a group share one area variable; a member without a group is its own. */
export function areaVariables(m: ModelFile): AreaVariable[] {
  const d = m.design;
  const bounds = d?.areaBounds ?? { min: Number.NaN, max: Number.NaN };
  const groupBounds = new Map((d?.groups ?? []).map((g) => [g.id, g]));
  const byId = new Map<string, AreaVariable>();
  const out: AreaVariable[] = [];
  for (const mem of m.members ?? []) {
    const key = mem.group ? `group:${mem.group}` : `member:${mem.id}`;
    let v = byId.get(key);
    if (!v) {
      const g = mem.group ? groupBounds.get(mem.group) : undefined;
      v = { id: mem.group ?? mem.id, members: [], min: g?.min ?? bounds.min, max: g?.max ?? bounds.max, initial: mem.area };
      byId.set(key, v);
      out.push(v);
    }
    v.members.push(mem.id);
  }
  return out;
}

const OBJECTIVE_WORDS: Record<string, string> = {
  mass: "minimum mass: the sum over members of density × area × length",
  compliance: "minimum compliance: the sum over load cases of the work of the loads, f·u (the stiffest truss for the material allowed)",
};
const FORMULATION_WORDS: Record<string, string> = {
  nested: "nested: displacements are eliminated by a stiffness solve at every design, with analytic sensitivities",
  simultaneous: "simultaneous: displacements are variables too, and equilibrium K(A, x) u = f is an equality constraint for each load case",
};

const OPTION_WORDS: Record<string, string> = {
  formulation: "formulation",
  objective: "objective",
  maxIterations: "iteration limit",
  tolerance: "tolerance",
  displacementLimit: "displacement limit (replaces every limit of the model)",
  volumeMax: "volume limit",
  stress: "stress check",
  buckling: "buckling check",
};

export function designSection(w: ReportWriter, data: ReportData) {
  const m = data.model.file;
  const u = unitLabels(data.result.units);
  w.newPage();
  w.heading("2  The design problem as posed");
  const d = m?.design;
  const opts = data.job.options ?? {};
  if (!m || !d) {
    w.paragraph("The model file holds no design block, so the problem is described by the result alone.", { face: "sans-italic", color: INK_MUTED });
  }
  const objective = (opts.objective as string | undefined) ?? d?.objective ?? data.result.objective.kind;
  const formulation = (opts.formulation as string | undefined) ?? data.result.formulation ?? d?.formulation ?? "nested";
  const c = d?.constraints ?? {};
  const stressOn = (opts.stress as boolean | undefined) ?? c.stress ?? false;
  const bucklingOn = (opts.buckling as boolean | undefined) ?? c.buckling !== undefined;
  const volumeMax = (opts.volumeMax as number | undefined) ?? c.volume?.max;
  w.facts([
    ["Objective", OBJECTIVE_WORDS[objective] ?? objective],
    ["Formulation", FORMULATION_WORDS[formulation] ?? formulation],
    [
      "Solver settings",
      `at most ${(opts.maxIterations as number | undefined) ?? d?.solver?.maxIterations ?? "the default number of"} iterations, tolerance ${formatNumber((opts.tolerance as number | undefined) ?? d?.solver?.tolerance ?? Number.NaN)}`.replace(
        "tolerance not a number",
        "default tolerance",
      ),
    ],
  ]);

  const overrides = Object.entries(opts).filter(([, v]) => v !== undefined);
  if (overrides.length > 0) {
    w.heading("Options set for this job", 2);
    w.paragraph("These options were chosen when the job was queued and take precedence over the model's design block.", { size: 8.5, color: INK_MUTED });
    w.facts(overrides.map(([k, v]) => [OPTION_WORDS[k] ?? k, typeof v === "boolean" ? (v ? "on" : "off") : typeof v === "number" ? formatNumber(v) : String(v)]));
  }

  w.heading("Limits", 2);
  const limits: [string, string][] = [
    ["Stress", stressOn ? "on: |σ| within the member material's allowable tension or compression, in every load case (materials table)" : "off"],
  ];
  if (bucklingOn && c.buckling) {
    limits.push([
      "Euler buckling",
      `on: compressive stress at most π²·E·I / ((k·L)²·A) with I = ${formatNumber(c.buckling.sectionRatio)} · A² and k = ${formatNumber(c.buckling.effectiveLengthFactor ?? 1)}`,
    ]);
  } else limits.push(["Euler buckling", bucklingOn ? "on (parameters from the job options)" : "off"]);
  limits.push(["Volume", volumeMax !== undefined ? `total volume Σ A·L at most ${formatNumber(volumeMax)} ${u.volume}` : "no limit"]);
  const dispOverride = opts.displacementLimit as number | undefined;
  const disp = dispOverride !== undefined ? [{ node: "*", axis: "all", limit: dispOverride }] : (c.displacement ?? []);
  limits.push(["Displacement", disp.length ? `${disp.length} limit${disp.length > 1 ? "s" : ""}, each displacement component bounded separately (table below)` : "no limit"]);
  w.facts(limits);
  if (disp.length) {
    table(
      w,
      [
        { header: "Node", weight: 3 },
        { header: "Axis", weight: 2 },
        { header: `Limit |u| (${u.length})`, weight: 3, align: "right" },
      ],
      disp.map((l) => [l.node === "*" ? "every node" : l.node, l.axis === "all" ? "x, y and z each" : l.axis, formatNumber(l.limit)]),
      { title: "Displacement limits" },
    );
  }

  if (m) {
    const vars = areaVariables(m);
    w.heading("Area variables", 2);
    w.paragraph(`${vars.length} area variable${vars.length === 1 ? "" : "s"}: members of a group share one area; a member without a group has its own.`, { size: 8.5, color: INK_MUTED });
    table(
      w,
      [
        { header: "Variable", weight: 3 },
        { header: "Members", weight: 4.6 },
        { header: `Lower bound (${u.area})`, weight: 2.2, align: "right" },
        { header: `Upper bound (${u.area})`, weight: 2.2, align: "right" },
        { header: `Start (${u.area})`, weight: 2, align: "right" },
      ],
      vars.map((v) => [v.id, v.members.length === 1 ? v.members[0]! : `${v.members.length}: ${v.members.join(", ")}`, formatNumber(v.min), formatNumber(v.max), formatNumber(v.initial)]),
    );
  }
  const shape = d?.shape ?? [];
  if (shape.length) {
    w.heading("Shape variables", 2);
    w.paragraph("Each variable is an offset from the uploaded geometry, starting at 0; every listed coordinate moves by factor × value.", { size: 8.5, color: INK_MUTED });
    table(
      w,
      [
        { header: "Variable", weight: 2.5 },
        { header: `Lower (${u.length})`, weight: 1.8, align: "right" },
        { header: `Upper (${u.length})`, weight: 1.8, align: "right" },
        { header: "Moves (node.axis × factor)", weight: 7 },
      ],
      shape.map((s) => [s.id, formatNumber(s.min), formatNumber(s.max), s.moves.map((mv) => `${mv.node}.${mv.axis} × ${formatNumber(mv.factor)}`).join(", ")]),
    );
  }
}
