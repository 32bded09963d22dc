/**
 * A JSON syntax scanner that locates things: where each value starts (by JSON pointer), which
 * object keys repeat, and the exact offset of the first syntax error. `JSON.parse` does the
 * actual parsing; this exists because its messages do not always carry a position and never
 * map a position back to a pointer. Iterative (an explicit stack), so arbitrarily deep nesting
 * cannot overflow the call stack.
 */

export interface JsonSyntaxError {
  offset: number;
  line: number;
  column: number;
  message: string;
}

export interface JsonScan {
  /** JSON pointer -> offset where the value starts (for object members: where the key starts). */
  positions: Map<string, number>;
  /** JSON pointer -> offset of the value itself (for object members: after the colon). */
  valueStarts: Map<string, number>;
  /** Keys that occur more than once in one object: pointer of the repeated member and its offset. */
  duplicateKeys: Array<{ pointer: string; offset: number }>;
  error?: JsonSyntaxError;
}

/** Escapes one reference token of a JSON pointer (RFC 6901: ~ as ~0, / as ~1). */
export function escapePointerToken(token: string | number): string {
  return String(token).replace(/~/g, '~0').replace(/\//g, '~1');
}

/** Joins reference tokens into a JSON pointer ("" for the whole document). */
export function pointer(tokens: ReadonlyArray<string | number>): string {
  return tokens.map((t) => '/' + escapePointerToken(t)).join('');
}

/**
 * 1-based line and column of a UTF-16 offset. Lines end at \n (a \r\n pair counts once);
 * columns count UTF-16 code units, as editors using JavaScript strings do. Cost: linear in
 * the offset.
 */
export function lineColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  const end = Math.min(offset, text.length);
  for (let i = 0; i < end; i++) {
    if (text.charCodeAt(i) === 10) {
      line++;
      lineStart = i + 1;
    }
  }
  return { line, column: end - lineStart + 1 };
}

type Frame = { kind: 'object'; path: string; keys: Set<string>; count: number } | { kind: 'array'; path: string; count: number };

const MAX_RECORDED_DEPTH = 32;
const WS = new Set([0x20, 0x09, 0x0a, 0x0d]);
const NUMBER = /-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?/y;

class ScanError extends Error {
  constructor(
    readonly offset: number,
    message: string,
  ) {
    super(message);
  }
}

/**
 * Scans `text` (without a byte-order mark) as JSON (RFC 8259). Never throws; a syntax error is
 * returned in `error` with a one-sentence message. Cost: one linear pass.
 */
export function scanJson(text: string): JsonScan {
  const positions = new Map<string, number>();
  const valueStarts = new Map<string, number>();
  const duplicateKeys: JsonScan['duplicateKeys'] = [];
  let i = 0;
  const n = text.length;
  const stack: Frame[] = [];

  const skipWs = () => {
    while (i < n && WS.has(text.charCodeAt(i))) i++;
  };
  const describe = (at: number) => (at >= n ? 'end of file' : `character '${text[at]}'`);

  const readString = (): string => {
    const start = i;
    i++;
    let out = '';
    let chunk = i;
    while (true) {
      if (i >= n) throw new ScanError(start, 'Unterminated string');
      const c = text.charCodeAt(i);
      if (c === 0x22) {
        out += text.slice(chunk, i);
        i++;
        return out;
      }
      if (c < 0x20) throw new ScanError(i, 'Control character (such as a raw line break) inside a string; write it as an escape like \\n');
      if (c === 0x5c) {
        out += text.slice(chunk, i);
        const e = text[i + 1];
        if (e === 'u') {
          const hex = text.slice(i + 2, i + 6);
          if (!/^[0-9a-fA-F]{4}$/.test(hex)) throw new ScanError(i + 1, 'Bad \\u escape: four hexadecimal digits must follow \\u');
          out += String.fromCharCode(parseInt(hex, 16));
          i += 6;
        } else if (e !== undefined && '"\\/bfnrt'.includes(e)) {
          out += JSON.parse(`"\\${e}"`) as string;
          i += 2;
        } else {
          throw new ScanError(i + 1, `Bad escape '\\${e ?? ''}' in a string`);
        }
        chunk = i;
        continue;
      }
      i++;
    }
  };

  // Reads one scalar, or opens a container by pushing a frame; returns after the token.
  const readValue = (path: string) => {
    skipWs();
    // Positions deeper than any codebook shape are never asked for; skipping them keeps a
    // pathologically deep file linear in memory.
    if (stack.length <= MAX_RECORDED_DEPTH) {
      if (!positions.has(path)) positions.set(path, i);
      valueStarts.set(path, i);
    }
    const c = text[i];
    if (c === '{') {
      i++;
      stack.push({ kind: 'object', path, keys: new Set(), count: 0 });
    } else if (c === '[') {
      i++;
      stack.push({ kind: 'array', path, count: 0 });
    } else if (c === '"') {
      readString();
    } else if (c === 't' || c === 'f' || c === 'n') {
      const word = c === 't' ? 'true' : c === 'f' ? 'false' : 'null';
      if (text.startsWith(word, i)) i += word.length;
      else throw new ScanError(i, `Unexpected ${describe(i)}: expected a value (true, false and null are lower case and unquoted)`);
    } else {
      NUMBER.lastIndex = i;
      const m = NUMBER.exec(text);
      if (!m || m[0].length === 0 || m[0] === '-') {
        throw new ScanError(i, `Unexpected ${describe(i)}: expected a value (a string, number, object, array, true, false or null)`);
      }
      if (/^-?0\d/.test(text.slice(i, i + m[0].length + 1))) throw new ScanError(i, 'Numbers must not have leading zeros');
      i += m[0].length;
    }
  };

  // Reads the key and colon of the next member of the object on top of the stack.
  const readMember = (f: Extract<Frame, { kind: 'object' }>) => {
    skipWs();
    if (text[i] !== '"') throw new ScanError(i, `Unexpected ${describe(i)}: expected a property name in double quotes`);
    const keyAt = i;
    const key = readString();
    const p = f.path + '/' + escapePointerToken(key);
    if (f.keys.has(key)) duplicateKeys.push({ pointer: p, offset: keyAt });
    f.keys.add(key);
    if (stack.length <= MAX_RECORDED_DEPTH) positions.set(p, keyAt);
    skipWs();
    if (text[i] !== ':') throw new ScanError(i, `Unexpected ${describe(i)}: expected ':' after property name "${key}"`);
    i++;
    f.count++;
    readValue(p);
  };

  try {
    skipWs();
    if (i >= n) throw new ScanError(i, 'The file is empty: expected a JSON object');
    readValue('');
    while (stack.length > 0) {
      const f = stack[stack.length - 1]!;
      skipWs();
      const c = text[i];
      if (f.kind === 'object') {
        if (f.count === 0) {
          if (c === '}') {
            i++;
            stack.pop();
            continue;
          }
          readMember(f);
          continue;
        }
        if (c === ',') {
          i++;
          skipWs();
          if (text[i] === '}') throw new ScanError(i, "Trailing comma before '}'");
          readMember(f);
        } else if (c === '}') {
          i++;
          stack.pop();
        } else {
          throw new ScanError(i, `Unexpected ${describe(i)}: expected ',' or '}' after a property value`);
        }
      } else {
        if (f.count === 0) {
          if (c === ']') {
            i++;
            stack.pop();
            continue;
          }
          f.count++;
          readValue(f.path + '/0');
          continue;
        }
        if (c === ',') {
          i++;
          skipWs();
          if (text[i] === ']') throw new ScanError(i, "Trailing comma before ']'");
          readValue(f.path + '/' + f.count++);
        } else if (c === ']') {
          i++;
          stack.pop();
        } else {
          throw new ScanError(i, `Unexpected ${describe(i)}: expected ',' or ']' after an array element`);
        }
      }
    }
    skipWs();
    if (i < n) throw new ScanError(i, `Unexpected ${describe(i)} after the end of the JSON document`);
  } catch (e) {
    if (!(e instanceof ScanError)) throw e;
    const { line, column } = lineColumn(text, e.offset);
    return { positions, valueStarts, duplicateKeys, error: { offset: e.offset, line, column, message: e.message } };
  }
  return { positions, valueStarts, duplicateKeys };
}
