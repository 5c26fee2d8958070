/**
 * Finds where a JSON text first goes wrong, as line and column (1-based). Node's JSON.parse does not
 * always say where; this small scanner follows RFC 8259 and stops at the first error.
 */
export interface JsonSyntaxProblem {
  readonly line: number;
  readonly column: number;
  readonly message: string;
}

export function locateJsonError(text: string): JsonSyntaxProblem | undefined {
  let i = 0;
  const n = text.length;
  const fail = (message: string): never => {
    throw new LocatedError(i, message);
  };
  const ws = (): void => {
    while (i < n && (text[i] === ' ' || text[i] === '\t' || text[i] === '\n' || text[i] === '\r')) i++;
  };
  const expect = (ch: string): void => {
    if (text[i] !== ch) fail(i >= n ? `unexpected end of input, expected '${ch}'` : `expected '${ch}' but found '${text[i]}'`);
    i++;
  };
  const str = (): void => {
    expect('"');
    while (true) {
      if (i >= n) fail('unterminated string');
      const c = text.charCodeAt(i);
      if (c === 0x22) {
        i++;
        return;
      }
      if (c < 0x20) fail('control character in string');
      if (c === 0x5c) {
        i++;
        const e = text[i];
        if (e === 'u') {
          if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 1, i + 5))) fail('bad \\u escape');
          i += 5;
        } else if (e !== undefined && '"\\/bfnrt'.includes(e)) i++;
        else fail('bad escape in string');
      } else i++;
    }
  };
  const num = (): void => {
    const m = /^-?(0|[1-9][0-9]*)(\.[0-9]+)?([eE][+-]?[0-9]+)?/.exec(text.slice(i, i + 400));
    if (!m || m[0].length === 0) fail(`unexpected character '${text[i]}'`);
    i += m![0].length;
  };
  const value = (): void => {
    ws();
    if (i >= n) fail('unexpected end of input, expected a value');
    const c = text[i];
    if (c === '{') {
      i++;
      ws();
      if (text[i] === '}') {
        i++;
        return;
      }
      while (true) {
        ws();
        if (text[i] !== '"') fail(i >= n ? 'unexpected end of input in object' : `expected a quoted key but found '${text[i]}'`);
        str();
        ws();
        expect(':');
        value();
        ws();
        if (text[i] === ',') {
          i++;
          continue;
        }
        if (text[i] === '}') {
          i++;
          return;
        }
        fail(i >= n ? 'unexpected end of input in object' : `expected ',' or '}' but found '${text[i]}'`);
      }
    } else if (c === '[') {
      i++;
      ws();
      if (text[i] === ']') {
        i++;
        return;
      }
      while (true) {
        value();
        ws();
        if (text[i] === ',') {
          i++;
          continue;
        }
        if (text[i] === ']') {
          i++;
          return;
        }
        fail(i >= n ? 'unexpected end of input in array' : `expected ',' or ']' but found '${text[i]}'`);
      }
    } else if (c === '"') str();
    else if (text.startsWith('true', i)) i += 4;
    else if (text.startsWith('false', i)) i += 5;
    else if (text.startsWith('null', i)) i += 4;
    else num();
  };
  try {
    value();
    ws();
    if (i < n) fail(`unexpected '${text[i]}' after the end of the document`);
    return undefined;
  } catch (e) {
    if (!(e instanceof LocatedError)) throw e;
    let line = 1;
    let col = 1;
    for (let k = 0; k < e.pos && k < n; k++) {
      if (text[k] === '\n') {
        line++;
        col = 1;
      } else col++;
    }
    return { line, column: col, message: e.message };
  }
}

class LocatedError extends Error {
  constructor(
    readonly pos: number,
    message: string,
  ) {
    super(message);
  }
}
