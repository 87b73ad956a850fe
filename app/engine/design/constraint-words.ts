// The one home of the rule that turns an engine constraint or check id into plain words
// ("stress:U4-U5:G+S" → "stress limit of member U4-U5 (nodes U4–U5) under Snow (G+S)"), for the
// engine's own messages, the job page, the compare page, the PDF report and the mail alike. Pure
// and isomorphic; it lives in the engine because the engine's messages name checks too
// (docs/decisions/0022-constraint-words-in-the-engine.md).
//
// The ids are the engine's (app/engine/design/problem.ts, verify.ts, shadow-prices.ts):
//   stress:<member>:<case>            stress-tension:… / stress-compression:… (older results)
//   buckling:<member>:<case>          displacement:<node>:<axis>:<case>
//   volume    length:<member>         equilibrium
//   area-min:<variable>  area-max:<variable>  shape-min:<variable>  shape-max:<variable>
// Member and node ids may themselves hold ":", so the case and axis are read from the end.
import type { Quantity } from "../truss/units";

/** Whatever names the load cases and combinations: a result, its head, or a model. */
export interface NamedCases {
  loadCases?: readonly { id: string; name?: string }[];
  combinations?: readonly { id: string; name?: string }[];
}

/** The plain name of a load case or combination: "Snow (G+S)", or the id when it has no name. */
export function caseWords(id: string | undefined, r?: NamedCases): string {
  if (!id) return "";
  const named = r?.loadCases?.find((l) => l.id === id)?.name ?? r?.combinations?.find((c) => c.id === id)?.name;
  return named ? `${named} (${id})` : id;
}

/** What the words may name: load cases and combinations with their names, members with their nodes, groups. */
export interface ConstraintContext extends NamedCases {
  members?: readonly { id: string; start?: string; end?: string; group?: string }[];
}

export type ConstraintKind =
  | "stress"
  | "stress-tension"
  | "stress-compression"
  | "buckling"
  | "displacement"
  | "volume"
  | "length"
  | "area-min"
  | "area-max"
  | "shape-min"
  | "shape-max"
  | "equilibrium";

export interface ParsedConstraint {
  kind: ConstraintKind;
  member?: string;
  node?: string;
  axis?: string;
  case?: string;
  variable?: string;
}

const KINDS = new Set<string>(["stress", "stress-tension", "stress-compression", "buckling", "displacement", "volume", "length", "area-min", "area-max", "shape-min", "shape-max", "equilibrium"]);

/** The parts of an id, or null for an id this version does not know (shown as it is). */
export function parseConstraintId(id: string): ParsedConstraint | null {
  const colon = id.indexOf(":");
  const kind = colon < 0 ? id : id.slice(0, colon);
  if (!KINDS.has(kind)) return null;
  const rest = colon < 0 ? [] : id.slice(colon + 1).split(":");
  const k = kind as ConstraintKind;
  switch (k) {
    case "stress":
    case "stress-tension":
    case "stress-compression":
    case "buckling":
      if (rest.length < 2) return rest.length === 1 ? { kind: k, member: rest[0] } : null;
      return { kind: k, member: rest.slice(0, -1).join(":"), case: rest[rest.length - 1] };
    case "displacement":
      if (rest.length < 3) return null;
      return { kind: k, node: rest.slice(0, -2).join(":"), axis: rest[rest.length - 2], case: rest[rest.length - 1] };
    case "length":
      return rest.length ? { kind: k, member: rest.join(":") } : null;
    case "area-min":
    case "area-max":
    case "shape-min":
    case "shape-max":
      return rest.length ? { kind: k, variable: rest.join(":") } : null;
    case "volume":
    case "equilibrium":
      return { kind: k };
  }
}

/** "member m5 (nodes L3–U4)"; the nodes only when the context knows them and the id does not already say them. */
export function memberWords(member: string, ctx?: ConstraintContext): string {
  const m = ctx?.members?.find((x) => x.id === member);
  if (!m?.start || !m.end || member === `${m.start}-${m.end}` || member === `${m.start}–${m.end}`) return `member ${member}`;
  return `member ${member} (nodes ${m.start}–${m.end})`;
}

/** An area variable is a group when members share it, else it is one member's own area. */
function variableWords(variable: string, ctx?: ConstraintContext): string {
  if (ctx?.members?.some((m) => m.group === variable)) return `group ${variable}`;
  if (ctx?.members?.some((m) => m.id === variable)) return memberWords(variable, ctx);
  return variable;
}

function under(c: string | undefined, ctx?: ConstraintContext): string {
  return c ? ` under ${caseWords(c, ctx)}` : "";
}

/**
 * A constraint or check id in plain words, without an article: "stress limit of member m5
 * (nodes L3–U4) under Dead load (LC1)", "displacement limit of node n3 along y under LC2",
 * "volume limit". An unknown id is returned as it is.
 */
export function constraintWords(id: string, ctx?: ConstraintContext): string {
  const p = parseConstraintId(id);
  if (!p) return id;
  switch (p.kind) {
    case "stress":
      return `stress limit of ${memberWords(p.member!, ctx)}${under(p.case, ctx)}`;
    case "stress-tension":
      return `tension stress limit of ${memberWords(p.member!, ctx)}${under(p.case, ctx)}`;
    case "stress-compression":
      return `compression stress limit of ${memberWords(p.member!, ctx)}${under(p.case, ctx)}`;
    case "buckling":
      return `buckling limit of ${memberWords(p.member!, ctx)}${under(p.case, ctx)}`;
    case "displacement":
      return `displacement limit of node ${p.node} along ${p.axis}${under(p.case, ctx)}`;
    case "volume":
      return "volume limit";
    case "length":
      return `shortest allowed length of ${memberWords(p.member!, ctx)}`;
    case "area-min":
      return `minimum area of ${variableWords(p.variable!, ctx)}`;
    case "area-max":
      return `maximum area of ${variableWords(p.variable!, ctx)}`;
    case "shape-min":
      return `lower end of shape variable ${p.variable}`;
    case "shape-max":
      return `upper end of shape variable ${p.variable}`;
    case "equilibrium":
      return "equilibrium of the re-analysis";
  }
}

/** What kind of limit an id is, in a word or two, for counts ("stress", "minimum size"); "other" when unknown. */
export function constraintKindWords(id: string): string {
  const kind = parseConstraintId(id)?.kind;
  switch (kind) {
    case "stress":
    case "stress-tension":
    case "stress-compression":
      return "stress";
    case "area-min":
      return "minimum size";
    case "area-max":
      return "maximum size";
    case "shape-min":
    case "shape-max":
      return "shape bound";
    case "length":
      return "member length";
    case undefined:
      return "other";
    default:
      return kind;
  }
}

/** The quantity a check's value and limit are in (null: a plain ratio, as the equilibrium residual). */
export function constraintQuantity(id: string): Quantity | null {
  switch (parseConstraintId(id)?.kind) {
    case "stress":
    case "stress-tension":
    case "stress-compression":
    case "buckling":
      return "stress";
    case "displacement":
    case "length":
    case "shape-min":
    case "shape-max":
      return "length";
    case "volume":
      return "volume";
    case "area-min":
    case "area-max":
      return "area";
    default:
      return null;
  }
}

/** The kind of a member's governing check ("stress:LC1" → "stress"), for the CSV beside its case column. */
export function governingCheckKind(governing: string | undefined): string {
  if (!governing) return "";
  const colon = governing.indexOf(":");
  return colon < 0 ? governing : governing.slice(0, colon);
}

/**
 * A member's governing check ("stress:LC1", "buckling:ULS-1", as ResultMember.governing holds
 * it) in words: "stress under Dead load (LC1)", "buckling under ULS-1".
 */
export function governingCheckWords(governing: string | undefined, ctx?: ConstraintContext): string {
  if (!governing) return "";
  const kind = governingCheckKind(governing);
  const c = kind.length < governing.length ? governing.slice(kind.length + 1) : undefined;
  return `${kind}${under(c, ctx)}`;
}
