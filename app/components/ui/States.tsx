// Empty, loading and error states, the same everywhere.
import type { ReactNode } from "react";

export function EmptyState({ title, children, action }: { title: string; children?: ReactNode; action?: ReactNode }) {
  return (
    <div className="rounded-[var(--radius-card)] border border-dashed border-rule bg-paper px-6 py-10 text-center">
      <p className="font-medium text-ink">{title}</p>
      {children && <div className="mx-auto mt-2 max-w-md text-sm text-ink-muted">{children}</div>}
      {action && <div className="mt-4">{action}</div>}
    </div>
  );
}

export function LoadingNote({ children = "Loading…" }: { children?: ReactNode }) {
  return (
    <p className="flex items-center gap-2 text-sm text-ink-muted" role="status">
      <span className="inline-block h-3 w-3 animate-spin rounded-full border-2 border-rule border-t-brass" aria-hidden />
      {children}
    </p>
  );
}

export function ErrorNote({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="rounded-md border border-bad/30 bg-bad-wash px-4 py-3 text-sm text-bad" role="alert">
      <p className="font-semibold">{title}</p>
      {children && <div className="mt-1 text-ink-soft">{children}</div>}
    </div>
  );
}

export interface Issue {
  path: string;
  message: string;
}

/** Validation problems, each with the item it names (a JSON path such as members[3].end). */
export function IssueList({ title, issues, tone = "bad" }: { title: string; issues: Issue[]; tone?: "bad" | "warn" }) {
  if (issues.length === 0) return null;
  const box = tone === "bad" ? "border-bad/30 bg-bad-wash" : "border-warn/30 bg-warn-wash";
  const head = tone === "bad" ? "text-bad" : "text-warn";
  return (
    <div className={`rounded-md border px-4 py-3 ${box}`} role={tone === "bad" ? "alert" : "status"} data-testid={`issues-${tone}`}>
      <p className={`text-sm font-semibold ${head}`}>
        {title} ({issues.length})
      </p>
      <ul className="mt-2 space-y-1 text-sm">
        {issues.map((issue, i) => (
          <li key={i} className="flex flex-col gap-x-3 sm:flex-row">
            {issue.path && <code className="shrink-0 font-mono text-xs text-ink">{issue.path}</code>}
            <span className="text-ink-soft">{issue.message}</span>
          </li>
        ))}
      </ul>
    </div>
  );
}

/** One summary figure. `words`: the value is a phrase ("all limits met"), set as text, not as a figure. */
export function Stat({ label, value, hint, wrap = false, words = false }: { label: string; value: ReactNode; hint?: string; wrap?: boolean; words?: boolean }) {
  return (
    <div className={wrap ? "col-span-2 min-w-0" : "min-w-0"}>
      <dt className="text-xs font-semibold text-ink-muted">{label}</dt>
      {/* a figure wraps rather than being cut off: "1 limit exceeded" must read whole */}
      <dd className={`${words ? "text-base" : "num text-lg"} mt-0.5 break-words text-left text-ink`} title={hint}>
        {value}
      </dd>
    </div>
  );
}
