/**
 * Finds where a JSON text first goes wrong, as line and column (1-based). Node's JSON.parse does not
 * always say where; this small scanner follows RFC 8259 and stops at the first error. It does not
 * recurse (a general-purpose parser such as jsonc-parser does, and overflows the stack on deeply
 * nested input), and it runs only on text that JSON.parse refused.
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
          i++;
          for (let h = 0; h < 4; h++, i++) if (!/[0-9a-fA-F]/.test(text[i] ?? '')) fail('bad \\u escape: expected 4 hex digits');
        } else if (e !== undefined && '"\\/bfnrt'.includes(e)) i++;
        else fail('bad escape in string');
      } else i++;
    }
  };
  const isDigit = (k: number): boolean => k < n && text.charCodeAt(k) >= 0x30 && text.charCodeAt(k) <= 0x39;
  const digits = (what: string): void => {
    if (!isDigit(i)) fail(i >= n ? `unexpected end of input, expected ${what}` : `expected ${what} but found '${text[i]}'`);
    while (isDigit(i)) i++;
  };
  const num = (): void => {
    const c = text[i];
    if (c !== '-' && !isDigit(i)) fail(`unexpected character '${c}'`);
    if (c === '-') i++;
    if (text[i] === '0') i++;
    else digits("a digit after '-'");
    if (text[i] === '.') {
      i++;
      digits("a digit after the decimal point");
    }
    if (text[i] === 'e' || text[i] === 'E') {
      i++;
      if (text[i] === '+' || text[i] === '-') i++;
      digits('a digit in the exponent');
    }
  };
  const literal = (word: string): void => {
    for (let k = 0; k < word.length; k++, i++) {
      if (text[i] !== word[k]) fail(i >= n ? `unexpected end of input in '${word}'` : `invalid literal, expected '${word}' but found '${text[i]}'`);
    }
  };
  // The structure is followed with an explicit stack of open containers (no recursion), so a
  // document nested 100 000 levels deep is located like any other.
  const stack: number[] = []; // OBJECT or ARRAY per open container
  const OBJECT = 1;
  const ARRAY = 2;
  const key = (): void => {
    ws();
    if (text[i] !== '"') fail(i >= n ? 'unexpected end of input in object' : `expected a quoted key but found '${text[i]}'`);
    str();
    ws();
    expect(':');
  };
  const document = (): void => {
    let wantValue = true;
    for (;;) {
      if (wantValue) {
        ws();
        if (i >= n) fail('unexpected end of input, expected a value');
        const c = text[i];
        if (c === '{') {
          i++;
          ws();
          if (text[i] === '}') i++;
          else {
            stack.push(OBJECT);
            key();
            continue;
          }
        } else if (c === '[') {
          i++;
          ws();
          if (text[i] === ']') i++;
          else {
            stack.push(ARRAY);
            continue;
          }
        } else if (c === '"') str();
        else if (c === 't') literal('true');
        else if (c === 'f') literal('false');
        else if (c === 'n') literal('null');
        else num();
        wantValue = false;
      }
      // after a value: close containers or move to the next entry
      if (stack.length === 0) return;
      ws();
      const top = stack[stack.length - 1];
      if (text[i] === ',') {
        i++;
        if (top === OBJECT) key();
        wantValue = true;
        continue;
      }
      if (text[i] === (top === OBJECT ? '}' : ']')) {
        i++;
        stack.pop();
        continue;
      }
      if (top === OBJECT) fail(i >= n ? 'unexpected end of input in object' : `expected ',' or '}' but found '${text[i]}'`);
      fail(i >= n ? 'unexpected end of input in array' : `expected ',' or ']' but found '${text[i]}'`);
    }
  };
  try {
    document();
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
