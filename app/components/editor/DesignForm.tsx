// The editor's design block as a form: what to optimize, the area bounds, the limits (stress,
// deflection, volume, buckling), the groups' bounds, shape variables and solver settings, each
// with its unit. The parser's problems appear under the field they are about, in its words.
// Turning the design off leaves a model that is only analysed.
import type { ReactNode } from "react";
import { DeflectionLimits } from "./DeflectionLimits";
import { quantityFormatter } from "~/lib/format";
import { gravityAxis, startingDesign, type DesignFields } from "./design-fields";
import { EditableGrid, type GridRow } from "./EditableGrid";
import { FieldProblems, problemsAt, type Problem } from "./field-problems";

interface Props {
  fields: DesignFields;
  onChange(fields: DesignFields): void;
  groups: GridRow[];
  onGroupsChange(rows: GridRow[]): void;
  /** the last model the parser accepted: its geometry gives the span, its members the starting areas */
  model: { dimension: 2 | 3; nodes: { id: string; x: number; y: number; z?: number }[]; members: { area?: number; group?: string }[] } | null;
  sectionCount: number;
  units: { length: string; force: string; mass: string };
  problems: Problem[];
  /** the design block as it will be saved, for the read-only view */
  json: unknown;
}

export function DesignForm({ fields: f, onChange, groups, onGroupsChange, model, sectionCount, units, problems, json }: Props) {
  const L = units.length;
  const set = (patch: Partial<DesignFields>) => onChange({ ...f, ...patch });
  const at = (path: string) => problemsAt(problems, path);
  const dimension = model?.dimension ?? 2;

  const turnOn = () => {
    onChange(model ? startingDesign(model, f) : { ...f, enabled: true });
    if (model && groups.length === 0) {
      const used = [...new Set(model.members.map((m) => m.group).filter((g): g is string => !!g))];
      if (used.length) onGroupsChange(used.map((id) => ({ id, min: "", max: "" })));
    }
  };

  return (
    <div className="space-y-5 text-sm" data-testid="design-form">
      <label className="flex items-start gap-2">
        <input type="checkbox" className="mt-0.5 h-4 w-4 accent-[var(--color-brass)]" checked={f.enabled} onChange={(e) => (e.target.checked ? turnOn() : set({ enabled: false }))} />
        <span>
          <span className="font-medium">Optimize this model</span>
          <span className="block text-ink-muted">
            {f.enabled ? "The design chooses member areas (and node positions, with shape variables) within the limits below." : "Off: the model is analysed as given (forces, stresses, displacements). Turn on to propose least mass with stress and span / 250 deflection limits."}
          </span>
        </span>
      </label>

      {f.enabled && (
        <>
          <Section title="Goal">
            <Field label="Objective" problems={at("design.objective")}>
              <select className="field-input" value={f.objective} onChange={(e) => set({ objective: e.target.value })}>
                <option value="mass">least mass ({units.mass})</option>
                <option value="compliance">stiffest: least compliance ({units.force}·{L})</option>
              </select>
            </Field>
            <Field label="Formulation" problems={at("design.formulation")} hint={(f.formulation || "nested") === "nested" ? "displacements from a stiffness solve" : "displacements are variables, equilibrium a constraint"}>
              <select className="field-input" value={f.formulation || "nested"} onChange={(e) => set({ formulation: e.target.value })}>
                <option value="nested">nested (default)</option>
                <option value="simultaneous">simultaneous</option>
              </select>
            </Field>
            <Field label="Sizing" problems={at("design.sizing")} hint={sectionCount ? `${sectionCount} sections in the model` : "catalogue sizing needs sections (Members tab)"}>
              <select className="field-input" value={f.sizing || "continuous"} onChange={(e) => set({ sizing: e.target.value })}>
                <option value="continuous">continuous areas</option>
                <option value="catalogue">one catalogue section per variable</option>
              </select>
            </Field>
          </Section>

          <Section title="Area bounds" note="Every area variable's range unless its group sets its own below. Empty: 1/10,000 to 100 times the largest starting area.">
            <NumberField label={`Smallest area (${L}²)`} value={f.areaMin} onChange={(v) => set({ areaMin: v })} problems={at("design.areaBounds.min")} />
            <NumberField label={`Largest area (${L}²)`} value={f.areaMax} onChange={(v) => set({ areaMax: v })} problems={[...at("design.areaBounds.max"), ...problems.filter((p) => p.path === "design.areaBounds")]} />
          </Section>

          <Section title="Limits">
            <label className="flex items-center gap-2 sm:col-span-3">
              <input type="checkbox" className="h-4 w-4 accent-[var(--color-brass)]" checked={f.stress === true} onChange={(e) => set({ stress: e.target.checked })} />
              Stress within each material's allowables (tension and compression, {quantityFormatter(units).unit("stress")})
            </label>
            <FieldProblems problems={at("design.constraints.stress")} />
            <div className="sm:col-span-3">
              <DeflectionLimits
                rows={f.displacement}
                onChange={(displacement) => set({ displacement })}
                nodes={model?.nodes ?? []}
                nodeIds={(model?.nodes ?? []).map((n) => n.id)}
                dimension={dimension}
                gravity={gravityAxis(dimension)}
                lengthUnit={L}
                problems={problems}
              />
            </div>
            <Toggle label="Volume cap" checked={f.volumeOn} onChange={(volumeOn) => set({ volumeOn })} />
            {f.volumeOn ? <NumberField label={`Total volume Σ A·L at most (${L}³)`} value={f.volumeMax} onChange={(v) => set({ volumeMax: v })} problems={at("design.constraints.volume")} /> : <span className="sm:col-span-2" />}
            <Toggle label="Buckling (Euler)" checked={f.bucklingOn} onChange={(bucklingOn) => set({ bucklingOn })} />
            {f.bucklingOn ? (
              <>
                <NumberField
                  label="Section ratio I / A² (no unit)"
                  value={f.sectionRatio}
                  onChange={(v) => set({ sectionRatio: v })}
                  problems={at("design.constraints.buckling.sectionRatio")}
                  hint={sectionCount ? "not used: I comes from the model's sections" : "e.g. 0.8 for a thin-walled round tube"}
                />
                <NumberField label="Effective length factor k" value={f.effectiveLengthFactor} placeholder="1" onChange={(v) => set({ effectiveLengthFactor: v })} problems={at("design.constraints.buckling.effectiveLengthFactor")} hint="a member's own k (Members tab) overrides it" />
              </>
            ) : (
              <span className="sm:col-span-2" />
            )}
          </Section>

          <Section title="Groups" note={`Members sharing a group share one area. A group's own bounds (${L}²) override the area bounds; empty: the area bounds.`}>
            <div className="sm:col-span-3">
              <EditableGrid
                name="groups"
                columns={[
                  { key: "id", label: "group", width: "minmax(7rem, 2fr)" },
                  { key: "min", label: `min area (${L}²)`, numeric: true },
                  { key: "max", label: `max area (${L}²)`, numeric: true },
                ]}
                rows={groups}
                onChange={onGroupsChange}
                height={Math.min(200, 30 * Math.max(2, groups.length) + 4)}
              />
              <FieldProblems problems={at("design.groups")} />
            </div>
          </Section>

          <Section title="Shape variables" note={`Each variable moves the listed node coordinates: coordinate = initial + factor · value, value between min and max (${L}). Moves: "node axis factor", separated by ";" (factor 1 when left out).`}>
            <div className="sm:col-span-3">
              <EditableGrid
                name="shape variables"
                columns={[
                  { key: "id", label: "variable" },
                  { key: "min", label: `min (${L})`, numeric: true },
                  { key: "max", label: `max (${L})`, numeric: true },
                  { key: "moves", label: "moves", width: "2fr" },
                ]}
                rows={f.shape}
                onChange={(shape) => set({ shape })}
                height={Math.min(200, 30 * Math.max(2, f.shape.length) + 4)}
              />
              <FieldProblems problems={at("design.shape")} />
            </div>
          </Section>

          <details className="rounded-md border border-rule px-3 py-2">
            <summary className="cursor-pointer font-medium">Solver settings</summary>
            <div className="mt-3 grid gap-3 sm:grid-cols-3">
              <NumberField label="Most iterations" value={f.maxIterations} placeholder="solver default" onChange={(v) => set({ maxIterations: v })} problems={at("design.solver.maxIterations")} />
              <NumberField label="Tolerance (relative)" value={f.tolerance} placeholder="solver default" onChange={(v) => set({ tolerance: v })} problems={at("design.solver.tolerance")} />
            </div>
          </details>
        </>
      )}
      <FieldProblems problems={problems.filter((p) => p.path === "design")} />

      <details className="rounded-md border border-rule px-3 py-2">
        <summary className="cursor-pointer font-medium">The design block as saved (JSON, read only)</summary>
        <pre className="mt-2 max-h-64 overflow-auto font-mono text-xs text-ink-soft" data-testid="design-json">
          {json === undefined ? "none: the model is only analysed" : JSON.stringify(json, null, 2)}
        </pre>
        <p className="mt-1 text-xs text-ink-muted">Field by field in docs/model-format.md, "The design block".</p>
      </details>
    </div>
  );
}

function Section({ title, note, children }: { title: string; note?: string; children: ReactNode }) {
  return (
    <fieldset className="space-y-2 border-t border-rule pt-3">
      <legend className="pr-2 font-semibold">{title}</legend>
      {note && <p className="text-xs text-ink-muted">{note}</p>}
      <div className="grid items-start gap-3 sm:grid-cols-3">{children}</div>
    </fieldset>
  );
}

function Field({ label, hint, problems, children }: { label: string; hint?: string; problems: Problem[]; children: ReactNode }) {
  return (
    <label className="block">
      <span className="field-label">{label}</span>
      {children}
      {hint && <span className="mt-1 block text-xs text-ink-muted">{hint}</span>}
      <FieldProblems problems={problems} />
    </label>
  );
}

function NumberField({ label, value, onChange, problems, placeholder, hint }: { label: string; value: string; onChange(v: string): void; problems: Problem[]; placeholder?: string; hint?: string }) {
  return (
    <Field label={label} hint={hint} problems={problems}>
      <input className="field-input text-right font-mono" inputMode="decimal" value={value} placeholder={placeholder} aria-invalid={problems.length > 0} onChange={(e) => onChange(e.target.value)} />
    </Field>
  );
}

function Toggle({ label, checked, onChange }: { label: string; checked: boolean; onChange(v: boolean): void }) {
  return (
    <label className="flex items-center gap-2 self-end pb-2">
      <input type="checkbox" className="h-4 w-4 accent-[var(--color-brass)]" checked={checked} onChange={(e) => onChange(e.target.checked)} />
      {label}
    </label>
  );
}
