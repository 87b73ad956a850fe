// A labelled input with its error under it, wired for screen readers (aria-describedby).
import { useId, type InputHTMLAttributes } from "react";

type Props = InputHTMLAttributes<HTMLInputElement> & { label: string; name: string; error?: string; hint?: string };

export function TextField({ label, name, error, hint, id, ...rest }: Props) {
  const auto = useId();
  const inputId = id ?? `${name}-${auto}`;
  const describedBy = [error ? `${inputId}-error` : null, hint ? `${inputId}-hint` : null].filter(Boolean).join(" ") || undefined;
  return (
    <div>
      <label htmlFor={inputId} className="field-label">{label}</label>
      <input id={inputId} name={name} className="field-input" aria-invalid={error ? true : undefined} aria-describedby={describedBy} {...rest} />
      {hint && <p id={`${inputId}-hint`} className="mt-1 text-xs text-ink-muted">{hint}</p>}
      {error && <p id={`${inputId}-error`} className="field-error">{error}</p>}
    </div>
  );
}
