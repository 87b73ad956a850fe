// Collecting validation issues with JSON paths and labels that name the item in the user's terms.

export type ModelIssue = { path: string; message: string };

export type PathPart = string | number;

export function formatPath(path: readonly PathPart[]): string {
  let out = "";
  for (const p of path) out += typeof p === "number" ? `[${p}]` : out ? `.${p}` : p;
  return out;
}

const isObj = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);

function idAt(raw: unknown, path: readonly PathPart[], key = "id"): string | undefined {
  let v: unknown = raw;
  for (const p of path) {
    if (v === null || typeof v !== "object") return undefined;
    v = (v as Record<string | number, unknown>)[p];
  }
  if (!isObj(v)) return undefined;
  const id = v[key];
  return typeof id === "string" && id.trim() ? id : undefined;
}

/** "member AB", "node 4 (nodes[3])", "load 2 of load case LC1": the item a path points into. */
export function labelFor(raw: unknown, path: readonly PathPart[]): string {
  const [a, i, b, j] = path;
  const named = (kind: string, p: readonly PathPart[], idx: number) => {
    const id = idAt(raw, p);
    return id !== undefined ? `${kind} ${id}` : `${kind} #${idx + 1}`;
  };
  if (typeof i === "number") {
    if (a === "materials") return named("material", [a, i], i);
    if (a === "nodes") return named("node", [a, i], i);
    if (a === "members") return named("member", [a, i], i);
    if (a === "loadCases") {
      const lc = named("load case", [a, i], i);
      if (b === "loads" && typeof j === "number") return `load #${j + 1} of ${lc}`;
      return lc;
    }
  }
  if (a === "design") {
    const [, sec, n1, sub, n2] = path;
    if (sec === "groups" && typeof n1 === "number") return named("design group", [a, sec, n1], n1);
    if (sec === "shape" && typeof n1 === "number") {
      const sv = named("shape variable", [a, sec, n1], n1);
      if (sub === "moves" && typeof n2 === "number") return `move #${n2 + 1} of ${sv}`;
      return sv;
    }
    if (sec === "constraints" && n1 === "displacement" && typeof sub === "number") return `displacement limit #${sub + 1}`;
    return "design block";
  }
  if (a === "units") return "units";
  return "model";
}

export class IssueList {
  readonly items: ModelIssue[] = [];
  dropped = 0;
  constructor(
    private readonly raw: unknown,
    private readonly cap: number,
  ) {}

  /** Adds "<label>: <message>" at path. */
  add(path: readonly PathPart[], message: string): void {
    if (this.items.length >= this.cap) {
      this.dropped++;
      return;
    }
    this.items.push({ path: formatPath(path), message: `${labelFor(this.raw, path)}: ${message}` });
  }

  /** Adds a message that names its items itself. */
  addPlain(path: readonly PathPart[], message: string): void {
    if (this.items.length >= this.cap) {
      this.dropped++;
      return;
    }
    this.items.push({ path: formatPath(path), message });
  }

  get length(): number {
    return this.items.length + this.dropped;
  }

  /** The list within the cap, its last entry saying how many were left out. */
  finish(kind: string): ModelIssue[] {
    if (this.dropped === 0) return this.items;
    const kept = this.items.slice(0, Math.max(0, this.cap - 1));
    const left = this.length - kept.length;
    kept.push({ path: "", message: `${left} more ${kind} not listed (only the first ${kept.length} are shown)` });
    return kept;
  }
}
