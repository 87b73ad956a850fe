// The result tables as CSV: every row, every load case and combination, full precision, the
// unit in each numeric column's header (area_mm2, force_ULS-1_N, stress_G_MPa, Rx_G_kN).
// Pure: the page's download buttons and the tests call the same builders.
import type { TrussResult } from "~/engine/design/result-types";
import { unitLabel } from "~/engine/truss/units";
import type { Units } from "~/engine/truss/schema";
import { governingCaseOf, resultCases } from "./cases";
import { governingCheckKind } from "~/engine/design/constraint-words";

export type CsvCell = string | number | boolean | null | undefined;
export interface CsvTable {
  header: string[];
  rows: CsvCell[][];
}

/** Header-safe unit text: mm² → mm2, N/mm² → N/mm2 (ASCII, as spreadsheets and scripts like them). */
function u(text: string): string {
  return text.replace(/²/g, "2").replace(/³/g, "3").replace(/⁴/g, "4");
}

function unitsOf(result: TrussResult) {
  const units = result.units as Units;
  return {
    length: u(units.length),
    area: u(unitLabel("area", units)),
    force: u(units.force),
    stress: u(unitLabel("stress", units)),
  };
}

interface TopologyLike {
  members: Map<string, { start: string; end: string; group?: string }>;
  nodes: Map<string, { fixed: string[] }>;
}

export function membersCsv(result: TrussResult, topology?: TopologyLike): CsvTable {
  const un = unitsOf(result);
  const ids = resultCases(result).map((c) => c.id);
  const withSection = result.members.some((m) => m.section !== undefined);
  const withK = result.members.some((m) => m.bucklingFactor !== undefined);
  const header = [
    "member",
    "start",
    "end",
    "group",
    ...(withSection ? ["section"] : []),
    `area_${un.area}`,
    `length_${un.length}`,
    ...(withK ? ["buckling_factor_k"] : []),
    ...ids.flatMap((l) => [`force_${l}_${un.force}`, `stress_${l}_${un.stress}`]),
    "utilization",
    "governing_check",
    "governing_case",
  ];
  const rows = result.members.map((m) => {
    const t = topology?.members.get(m.id);
    return [
      m.id,
      m.start ?? t?.start,
      m.end ?? t?.end,
      m.group ?? t?.group,
      ...(withSection ? [m.section] : []),
      m.area,
      m.length,
      ...(withK ? [m.bucklingFactor] : []),
      ...ids.flatMap((l) => [m.force[l], m.stress[l]]),
      m.utilization,
      governingCheckKind(m.governing), // "stress" or "buckling"; the case is the next column
      governingCaseOf(m, ids),
    ];
  });
  return { header, rows };
}

export function nodesCsv(result: TrussResult, topology?: TopologyLike): CsvTable {
  const un = unitsOf(result);
  const ids = resultCases(result).map((c) => c.id);
  const header = ["node", `x_${un.length}`, `y_${un.length}`, `z_${un.length}`, "restrained", ...ids.flatMap((l) => [`ux_${l}_${un.length}`, `uy_${l}_${un.length}`, `uz_${l}_${un.length}`])];
  const rows = result.nodes.map((n) => [
    n.id,
    n.x,
    n.y,
    n.z,
    (n.fixed ?? topology?.nodes.get(n.id)?.fixed ?? []).join(" "),
    ...ids.flatMap((l) => n.displacement[l] ?? [null, null, null]),
  ]);
  return { header, rows };
}

/**
 * Reactions per supported node and case, then one "sum" row per case and the applied load
 * with own weight it balances (from the result's balance check), so a spreadsheet can redo it.
 */
export function reactionsCsv(result: TrussResult): CsvTable {
  const un = unitsOf(result);
  const ids = resultCases(result).map((c) => c.id);
  const header = ["node", ...ids.flatMap((l) => [`Rx_${l}_${un.force}`, `Ry_${l}_${un.force}`, `Rz_${l}_${un.force}`])];
  const rows: CsvCell[][] = (result.reactions ?? []).map((r) => [r.node, ...ids.flatMap((l) => r.values[l] ?? [null, null, null])]);
  const balance = new Map((result.reactionBalance ?? []).map((b) => [b.id, b]));
  if (balance.size) {
    rows.push(["(sum of reactions)", ...ids.flatMap((l) => balance.get(l)?.reactions ?? [null, null, null])]);
    rows.push(["(applied loads and own weight)", ...ids.flatMap((l) => balance.get(l)?.applied ?? [null, null, null])]);
  }
  return { header, rows };
}
