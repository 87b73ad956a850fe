// The parser's problems shown beside the form field they are about: a problem belongs to a
// field when its path is the field's path or lies inside it (design.areaBounds.min belongs to
// design.areaBounds). The words are the parser's, the same an upload gets.
export interface Problem {
  path: string;
  message: string;
}

export function problemsAt(problems: Problem[], path: string): Problem[] {
  return problems.filter((p) => p.path === path || p.path.startsWith(`${path}.`) || p.path.startsWith(`${path}[`));
}

export function FieldProblems({ problems, id }: { problems: Problem[]; id?: string }) {
  if (problems.length === 0) return null;
  return (
    <ul id={id} className="field-error space-y-0.5 text-xs" data-testid="field-problem">
      {problems.map((p, i) => (
        <li key={i}>{p.message}</li>
      ))}
    </ul>
  );
}
