// Where a JSON text breaks the grammar, for messages that point at a line and column.
/**
 * Where a JSON text first breaks the grammar (RFC 8259), as line and column (1-based) with a
 * short reason. JSON.parse on Node 20 does not always say where; this walk does.
 */
export function locateJsonError(text: string): { line: number; column: number; message: string } {
  let i = 0;
  const fail = (message: string): never => {
    throw Object.assign(new Error(message), { offset: i });
  };
  const ws = () => {
    while (i < text.length && " \t\n\r".includes(text[i]!)) i++;
  };
  const literal = (word: string) => {
    if (text.startsWith(word, i)) i += word.length;
    else fail(`unexpected ${describe(text[i])}`);
  };
  const string = () => {
    i++; // opening quote
    while (i < text.length) {
      const c = text[i]!;
      if (c === '"') return void i++;
      if (c === "\\") {
        const e = text[i + 1];
        if (e === "u") {
          if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 2, i + 6))) fail("bad \\u escape in a string");
          i += 6;
        } else if (e !== undefined && '"\\/bfnrt'.includes(e)) i += 2;
        else fail("bad escape in a string");
      } else if (c.charCodeAt(0) < 0x20) fail("line break or control character inside a string");
      else i++;
    }
    fail("a string is not closed");
  };
  const number = () => {
    const m = /^-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?/.exec(text.slice(i, i + 400));
    if (!m) fail(`unexpected ${describe(text[i])}`);
    i += m![0].length;
  };
  const value = (): void => {
    ws();
    const c = text[i];
    if (c === undefined) fail("the file ends where a value was expected");
    if (c === "{") {
      i++;
      ws();
      if (text[i] === "}") return void i++;
      for (;;) {
        ws();
        if (text[i] !== '"') fail(`expected a property name in double quotes, found ${describe(text[i])}`);
        string();
        ws();
        if (text[i] !== ":") fail(`expected ':' after a property name, found ${describe(text[i])}`);
        i++;
        value();
        ws();
        if (text[i] === ",") {
          i++;
          continue;
        }
        if (text[i] === "}") return void i++;
        fail(`expected ',' or '}' in an object, found ${describe(text[i])}`);
      }
    }
    if (c === "[") {
      i++;
      ws();
      if (text[i] === "]") return void i++;
      for (;;) {
        value();
        ws();
        if (text[i] === ",") {
          i++;
          continue;
        }
        if (text[i] === "]") return void i++;
        fail(`expected ',' or ']' in a list, found ${describe(text[i])}`);
      }
    }
    if (c === '"') return string();
    if (c === "t") return literal("true");
    if (c === "f") return literal("false");
    if (c === "n") return literal("null");
    return number();
  };
  let message = "";
  try {
    value();
    ws();
    if (i < text.length) fail(`unexpected ${describe(text[i])} after the end of the document`);
  } catch (e) {
    message = (e as Error).message;
  }
  const before = text.slice(0, i);
  const line = before.split("\n").length;
  const column = i - (before.lastIndexOf("\n") + 1) + 1;
  return { line, column, message };
}

function describe(c: string | undefined): string {
  if (c === undefined) return "the end of the file";
  if (c === "\n" || c === "\r") return "a line break";
  return `'${c}'`;
}
