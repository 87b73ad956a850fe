// Plain words for what each design criterion costs (result.criterionCosts) and for the
// deflection summary (result.deflections): one home for the job page and the PDF report.
// Pure and isomorphic; numbers go through the one formatter in the reader's display units.
import type { CriterionCost, CriterionPlace, DeflectionSummary, TrussResult } from "~/engine/design/result-types";
import { formatNumber, formatPercent, quantityFormatter, type QuantityFormatter } from "~/lib/format";
import type { Quantity } from "~/engine/truss/units";
import { caseWords } from "./cases";
import { constraintQuantity } from "~/engine/design/constraint-words";

type Facts = Pick<TrussResult, "objective" | "units" | "loadCases" | "combinations"> & { members?: TrussResult["members"] };

const QUANTITY: Record<CriterionCost["kind"], Quantity | null> = {
  "allowable-tension": "stress",
  "allowable-compression": "stress",
  deflection: "length",
  volume: "volume",
  "buckling-length": null,
  "min-size": "area",
  "max-size": "area",
  "shape-range": "length",
};

function fmtOf(r: Facts, q?: QuantityFormatter): QuantityFormatter {
  return q ?? quantityFormatter(r.units);
}

/** The criterion's present value with its unit: "355.0 MPa", "2.000 in", "k = 1.000". */
export function criterionValue(c: CriterionCost, r: Facts, q?: QuantityFormatter): string {
  const quantity = QUANTITY[c.kind];
  if (!quantity) return `buckling length ${formatNumber(c.value)} × member length`;
  return fmtOf(r, q).text(c.value, quantity);
}

function directionWords(axis: CriterionCost["axis"] | undefined): string {
  return axis === "all" || axis === undefined ? "in every direction" : `in ${axis}`;
}

/** What the criterion is, without its value: "the allowable tension stress of S355". */
export function criterionName(c: CriterionCost): string {
  switch (c.kind) {
    case "allowable-tension":
      return `the allowable tension stress of ${c.subject}`;
    case "allowable-compression":
      return `the allowable compression stress of ${c.subject}`;
    case "deflection":
      return c.node === "*" ? `the deflection limit at every node ${directionWords(c.axis)}` : `the deflection limit at node ${c.node} ${directionWords(c.axis)}`;
    case "volume":
      return "the volume cap";
    case "buckling-length":
      // the subject is an area variable: a group, or an ungrouped member (then it binds only there)
      return `the buckling length of ${c.places.length > 0 && c.places.every((p) => p.member === c.subject) ? "member" : "group"} ${c.subject}`;
    case "min-size":
      return c.subject === "*" ? "the minimum area" : `the minimum area of group ${c.subject}`;
    case "max-size":
      return c.subject === "*" ? "the maximum area" : `the maximum area of group ${c.subject}`;
    case "shape-range":
      return `the range of shape variable ${c.subject}`;
  }
}

/** How a 1 % relaxation reads for the kind: a limit is raised, a minimum lowered, a length shortened. */
function relaxVerb(c: CriterionCost): string {
  switch (c.kind) {
    case "min-size":
      return "Lowering";
    case "buckling-length":
      return "Shortening";
    case "shape-range":
      return "Widening";
    default:
      return "Raising";
  }
}

/** The saving in the objective's unit: "3.1 kg" */
export function savingText(c: CriterionCost, r: Facts, q?: QuantityFormatter): string {
  return fmtOf(r, q).text(c.saving, r.objective.kind === "mass" ? "mass" : "compliance", { sig: 2 });
}

/** "0.5 %", "0.04 %", "below 0.01 %" */
export function shareText(share: number): string {
  if (share > 0 && share < 1e-4) return "below 0.01 %";
  return formatPercent(share, share >= 1e-3 ? 1 : 2);
}

/** "member U4-U5 under G+S", "node C in y under SLS", "group diagonals" (case ids: a list names many) */
export function placeWords(p: CriterionPlace, r: Facts): string {
  const under = p.case ? ` under ${p.case}` : "";
  if (p.member) return `member ${p.member}${under}`;
  if (p.node) return `node ${p.node}${p.axis ? ` in ${p.axis}` : ""}${under}`;
  if (p.variable) return r.members?.some((m) => m.group === p.variable) || !r.members ? `group ${p.variable}` : `member ${p.variable}`;
  return "the whole design";
}

/** The places in words, "and N more" when the result keeps fewer than bind. */
export function placesWords(c: CriterionCost, r: Facts, max = 3): string {
  if (c.count === 0) return "does not bind at this design";
  const shown = c.places.slice(0, max).map((p) => placeWords(p, r));
  const more = c.count - shown.length;
  return more > 0 ? `${shown.join(", ")} and ${more} more` : shown.join(", ");
}

/**
 * "Raising the allowable tension stress of S355 (355.0 MPa) by 1 % would save about 3.1 kg, 0.5 %
 * of the mass; it binds at member U4-U5 under Snow (G+S)."
 */
export function criterionSentence(c: CriterionCost, r: Facts, q?: QuantityFormatter): string {
  const name = criterionName(c);
  const value = c.kind === "buckling-length" ? "" : ` (${criterionValue(c, r, q)})`;
  const save = r.objective.kind === "mass" ? "would save about" : "would lower the compliance by about";
  return `${relaxVerb(c)} ${name}${value} by 1 % ${save} ${savingText(c, r, q)}, ${shareText(c.share)} of the ${r.objective.kind}; it binds at ${placesWords(c, r)}.`;
}

/**
 * A criterion that would save less than this share of the objective is below what the run can
 * tell apart from nothing (the solver stops at a KKT residual of about 1e-6): it is folded with
 * the criteria that do not bind instead of taking a row of its own.
 */
export const NEGLIGIBLE_SHARE = 1e-6;

const matters = (c: CriterionCost) => c.saving > 0 && c.share >= NEGLIGIBLE_SHARE;

/** Criteria that bind, the costliest first: the page and the report word the first three. */
export function bindingCriteria(costs: readonly CriterionCost[] | undefined): CriterionCost[] {
  return (costs ?? []).filter(matters);
}

/** Criteria that do not bind, or save too little to tell: one line, not a row each. */
export function idleCriteria(costs: readonly CriterionCost[] | undefined): CriterionCost[] {
  return (costs ?? []).filter((c) => !matters(c));
}

/** How criteria of one kind are named together: the shared start of their names, singular and plural. */
const SHARED_START: Record<CriterionCost["kind"], [string, string] | null> = {
  deflection: ["the deflection limit at ", "the deflection limits at "],
  "allowable-tension": ["the allowable tension stress of ", "the allowable tension stresses of "],
  "allowable-compression": ["the allowable compression stress of ", "the allowable compression stresses of "],
  "buckling-length": ["the buckling length of ", "the buckling lengths of "],
  "min-size": ["the minimum area of ", "the minimum areas of "],
  "max-size": ["the maximum area of ", "the maximum areas of "],
  "shape-range": ["the range of shape variable ", "the ranges of shape variables "],
  volume: null,
};

/** "a", "a and b", "a, b and c" */
function listWords(items: string[]): string {
  return items.length <= 1 ? (items[0] ?? "") : `${items.slice(0, -1).join(", ")} and ${items[items.length - 1]}`;
}

/** The folded criteria by kind: "the deflection limits at node 3 in y and every node in x; the volume cap". */
export function idleCriteriaWords(idle: readonly CriterionCost[]): string {
  const byKind = new Map<CriterionCost["kind"], string[]>();
  for (const c of idle) byKind.set(c.kind, [...(byKind.get(c.kind) ?? []), criterionName(c)]);
  const parts: string[] = [];
  for (const [kind, names] of byKind) {
    const start = SHARED_START[kind];
    const shared = start ? names.filter((n) => n.startsWith(start[0])) : [];
    const own = names.filter((n) => !shared.includes(n));
    if (start && shared.length) parts.push(`${shared.length === 1 ? start[0] : start[1]}${listWords(shared.map((n) => n.slice(start[0].length)))}`);
    parts.push(...own);
  }
  return parts.join("; ");
}

/**
 * One sentence for every criterion that does not bind: "12 other criteria do not bind at this
 * design: the deflection limits at node 3 in y, node 5 in y and every node in x." `others`:
 * whether binding criteria were listed before it.
 */
export function idleCriteriaSentence(idle: readonly CriterionCost[], r: Pick<TrussResult, "objective">, others = true): string {
  if (idle.length === 0) return "";
  const n = idle.length;
  const subject = `${n}${others ? " other" : ""} ${n === 1 ? "criterion does" : "criteria do"} not bind at this design`;
  const tiny = idle.some((c) => c.saving > 0);
  const qualifier = tiny ? ` or would save less than ${formatPercent(NEGLIGIBLE_SHARE, 4)} of the ${r.objective.kind}` : "";
  return `${subject}${qualifier}: ${idleCriteriaWords(idle)}.`;
}

/** "−12.3 mm in y at node C" */
export function displacementWords(d: { node: string; axis: string; value: number }, r: Facts, q?: QuantityFormatter): string {
  return `${fmtOf(r, q).text(d.value, "length")} in ${d.axis} at node ${d.node}`;
}

/** One line per case: worst displacement against its limit, in words. */
export function deflectionSentence(d: DeflectionSummary, r: Facts, q?: QuantityFormatter): string {
  const name = caseWords(d.case, r);
  if (d.governing) {
    const g = d.governing;
    const over = g.ratio > 1 + 1e-9;
    return `${name}: ${displacementWords(g, r, q)}, ${formatPercent(g.ratio)} of its ${fmtOf(r, q).text(g.limit, "length")} limit${over ? " — over the limit" : ""}.`;
  }
  return `${name}: largest ${displacementWords(d.largest, r, q)}${d.checked ? "" : " (no deflection limit applies to it)"}.`;
}

/**
 * The unit of a limit's shadow price in the model's units, "t per MPa": spelled here rather than
 * read from the stored price, so a result stored before the unit spelling settled reads as a new one.
 */
export function shadowPriceUnit(id: string, r: Pick<TrussResult, "objective" | "units">): string {
  const q = quantityFormatter(r.units);
  const quantity = constraintQuantity(id);
  return `${q.unit(r.objective.kind === "mass" ? "mass" : "compliance")} per ${quantity ? q.unit(quantity) : "unit"}`;
}
