// How deeply a JSON text nests, found by one pass over the characters (strings skipped), before
// anything parses it: a document of a million "[" parses, but every later walk over it
// (validation, warnings, copies) recurses and overflows the stack. A truss model nests six
// levels; requests and models are refused past MAX_JSON_DEPTH with the position of the opening
// bracket that went too deep.
export const MAX_JSON_DEPTH = 64;

export interface TooDeep {
  depth: number;
  line: number;
  column: number;
}

/** The first place where `text` nests deeper than `max`, or null. Line and column count from 1. */
export function findTooDeep(text: string, max = MAX_JSON_DEPTH): TooDeep | null {
  let depth = 0;
  let line = 1;
  let lineStart = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 92 /* \ */) i++;
      else if (c === 34 /* " */) inString = false;
      else if (c === 10) [line, lineStart] = [line + 1, i + 1];
      continue;
    }
    if (c === 34) inString = true;
    else if (c === 10) [line, lineStart] = [line + 1, i + 1];
    else if (c === 123 || c === 91 /* { [ */) {
      depth++;
      if (depth > max) return { depth, line, column: i - lineStart + 1 };
    } else if (c === 125 || c === 93) depth--;
  }
  return null;
}

export function tooDeepMessage(what: string, at: TooDeep, max = MAX_JSON_DEPTH): string {
  return `${what} nests more than ${max} levels deep (line ${at.line}, column ${at.column}); nothing this app reads needs more than ${max}`;
}
