// Queue an optimization run of a model. The browser checks the fields with the same schema
// as the server before sending; the server's answer (field errors or a redirect to the new
// job) is the final word.
import { useState, type ReactNode } from "react";
import { Form, useNavigation } from "react-router";
import { parseQueueForm, type QueueField } from "./queue-form";
import { FORMULATION_WORDS, formulationWords } from "./result-words";

export interface QueueDefaults {
  formulation: string;
  objective: string;
  maxIterations: number | null;
  tolerance: number | null;
  displacementLimit: number | null;
  volumeMax: number | null;
  stress: boolean | null;
  buckling: boolean | null;
  lengthUnit: string;
}

/** `answers`: the returned run ("changes requested") the new run answers; both pages link to each other. */
export function QueueForm({ defaults, serverErrors, answers }: { defaults: QueueDefaults; serverErrors?: Partial<Record<QueueField | "form", string>>; answers?: string | null }) {
  const [errors, setErrors] = useState<Partial<Record<QueueField | "form", string>>>({});
  const nav = useNavigation();
  const busy = nav.state !== "idle" && nav.formMethod?.toLowerCase() === "post";
  const shown = { ...serverErrors, ...errors };
  const err = (f: QueueField) =>
    shown[f] ? (
      <p className="field-error" id={`${f}-error`}>
        {shown[f]}
      </p>
    ) : null;
  const aria = (f: QueueField) => ariaOf(f, shown[f]);
  const u = defaults.lengthUnit;

  return (
    <Form
      method="post"
      noValidate
      className="space-y-4"
      aria-label="Queue an optimization job"
      data-testid="queue-form"
      onSubmit={(e) => {
        const fd = new FormData(e.currentTarget);
        const r = parseQueueForm((n) => fd.get(n));
        if (!r.ok) {
          e.preventDefault();
          setErrors(r.fieldErrors);
        } else setErrors({});
      }}
    >
      <input type="hidden" name="intent" value="queue" />
      {answers && (
        <p className="rounded-md border border-warn/30 bg-warn-wash px-3 py-2 text-sm" data-testid="answers-note">
          <input type="hidden" name="answers" value={answers} />
          This run answers job{" "}
          <a href={`/jobs/${answers}`} className="font-mono text-info hover:underline">
            {answers.slice(0, 8)}
          </a>
          , which a checker returned with changes requested; each page will link to the other.
        </p>
      )}
      <div className="grid gap-4 sm:grid-cols-2">
        <label className="block">
          <span className="field-label">Formulation</span>
          <select name="formulation" className="field-input" defaultValue="default" {...aria("formulation")}>
            <option value="default">as in the model ({formulationWords(defaults.formulation)})</option>
            <option value="nested">{FORMULATION_WORDS.nested}</option>
            <option value="simultaneous">{FORMULATION_WORDS.simultaneous}</option>
          </select>
          {err("formulation")}
        </label>
        <label className="block">
          <span className="field-label">Objective</span>
          <select name="objective" className="field-input" defaultValue="default" {...aria("objective")}>
            <option value="default">as in the model ({defaults.objective})</option>
            <option value="mass">minimum mass</option>
            <option value="compliance">minimum compliance</option>
          </select>
          {err("objective")}
        </label>
        <label className="block">
          <span className="field-label">Iteration cap</span>
          <input name="maxIterations" inputMode="numeric" className="field-input" placeholder={String(defaults.maxIterations ?? 200)} {...aria("maxIterations")} />
          {err("maxIterations")}
        </label>
        <label className="block">
          <span className="field-label">Tolerance</span>
          <input name="tolerance" inputMode="decimal" className="field-input" placeholder={String(defaults.tolerance ?? 1e-6)} {...aria("tolerance")} />
          {err("tolerance")}
        </label>
        <label className="block">
          <span className="field-label">Displacement limit ({u})</span>
          <input name="displacementLimit" inputMode="decimal" className="field-input" placeholder={defaults.displacementLimit !== null ? String(defaults.displacementLimit) : "none in the model"} {...aria("displacementLimit")} />
          {err("displacementLimit")}
        </label>
        <label className="block">
          <span className="field-label">Volume limit ({u}³)</span>
          <input name="volumeMax" inputMode="decimal" className="field-input" placeholder={defaults.volumeMax !== null ? String(defaults.volumeMax) : "none in the model"} {...aria("volumeMax")} />
          {err("volumeMax")}
        </label>
        <CheckSelect name="stress" label="Stress check" inModel={defaults.stress} aria={aria("stress")} error={err("stress")} />
        <CheckSelect name="buckling" label="Buckling check" inModel={defaults.buckling} aria={aria("buckling")} error={err("buckling")} />
      </div>
      <p className="text-xs text-ink-muted">Empty fields keep the values of the model's design block. Overrides apply to this run only.</p>
      {shown.form && (
        <p className="field-error" role="alert">
          {shown.form}
        </p>
      )}
      <button type="submit" className="btn btn-accent" disabled={busy}>
        {busy ? "Queueing…" : "Queue job"}
      </button>
    </Form>
  );
}

/** A limit check the run may switch on or off, or leave as the model's design block has it. */
function CheckSelect(props: { name: QueueField; label: string; inModel: boolean | null; aria: ReturnType<typeof ariaOf>; error: ReactNode }) {
  return (
    <label className="block">
      <span className="field-label">{props.label}</span>
      <select name={props.name} className="field-input" defaultValue="default" {...props.aria}>
        <option value="default">as in the model ({props.inModel ? "on" : "off"})</option>
        <option value="on">on</option>
        <option value="off">off</option>
      </select>
      {props.error}
    </label>
  );
}

function ariaOf(field: QueueField, error: string | undefined) {
  return { "aria-invalid": !!error, "aria-describedby": error ? `${field}-error` : undefined };
}
