import { CliError, EXIT } from './cli-error';

/**
 * JSON.parse, with a failure that says where: line, column and what was expected there, plus the
 * offending line with a caret. V8's own message names no position for some mistakes (a bare word,
 * a misspelt `true`) and words it differently from one Node version to the next.
 */
export function parseJson(text: string, name: string): unknown {
  if (text.trim() === '') throw new CliError(`${name} is empty; it should hold one JSON object.`, { exitCode: EXIT.usage });
  try {
    return JSON.parse(text);
  } catch (e) {
    const found = locateJsonError(text);
    if (!found) throw new CliError(`${name} is not valid JSON: ${(e as Error).message}`, { exitCode: EXIT.usage, cause: e });
    const { line, column } = lineAndColumn(text, found.offset);
    throw new CliError(`${name} is not valid JSON: line ${line}, column ${column}: expected ${found.expected}, found ${describeAt(text, found.offset)}.`, {
      exitCode: EXIT.usage,
      hint: excerpt(text, found.offset),
      cause: e,
    });
  }
}

class Located {
  constructor(
    readonly offset: number,
    readonly expected: string,
  ) {}
}

/** Deeper nesting than any spec has; past it we fall back to V8's message rather than recurse on. */
const MAX_DEPTH = 1000;

/** Where a strict JSON reader first stops, and what it wanted there; null when the text is valid. */
export function locateJsonError(text: string): { offset: number; expected: string } | null {
  let i = 0;
  const fail = (expected: string): never => {
    throw new Located(i, expected);
  };
  const skipSpace = () => {
    while (i < text.length && (text[i] === ' ' || text[i] === '\t' || text[i] === '\n' || text[i] === '\r')) i++;
  };
  const string = () => {
    i++;
    for (;;) {
      if (i >= text.length) fail('the closing " of the string');
      const c = text[i];
      if (c === '"') {
        i++;
        return;
      }
      if (c < ' ') fail('the closing " of the string before the line ends (write \\n for a line break)');
      if (c === '\\') {
        i++;
        if (i < text.length && '"\\/bfnrt'.includes(text[i])) i++;
        else if (text[i] === 'u' && /^[0-9a-fA-F]{4}$/.test(text.slice(i + 1, i + 5))) i += 5;
        else fail('an escape such as \\" \\\\ \\n or \\u00e9 after the backslash');
        continue;
      }
      i++;
    }
  };
  const number = () => {
    const match = /-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?/y;
    match.lastIndex = i;
    if (!match.exec(text)) fail('a number');
    i = match.lastIndex;
  };
  const value = (depth: number): void => {
    if (depth > MAX_DEPTH) throw new RangeError('too deep');
    skipSpace();
    const c = text[i];
    if (c === '{') {
      i++;
      skipSpace();
      if (text[i] === '}') {
        i++;
        return;
      }
      for (;;) {
        skipSpace();
        if (text[i] !== '"') fail('a property name in double quotes');
        string();
        skipSpace();
        if (text[i] !== ':') fail("':' after the property name");
        i++;
        value(depth + 1);
        skipSpace();
        if (text[i] === '}') {
          i++;
          return;
        }
        if (text[i] !== ',') fail("',' or '}' after the property value");
        i++;
        skipSpace();
        if (text[i] === '}') fail("another property after ',' (JSON allows no comma before '}')");
      }
    }
    if (c === '[') {
      i++;
      skipSpace();
      if (text[i] === ']') {
        i++;
        return;
      }
      for (;;) {
        value(depth + 1);
        skipSpace();
        if (text[i] === ']') {
          i++;
          return;
        }
        if (text[i] !== ',') fail("',' or ']' after the array element");
        i++;
        skipSpace();
        if (text[i] === ']') fail("another element after ',' (JSON allows no comma before ']')");
      }
    }
    if (c === '"') return string();
    if (c === '-' || (c >= '0' && c <= '9')) return number();
    for (const word of ['true', 'false', 'null']) {
      if (text.startsWith(word, i)) {
        i += word.length;
        return;
      }
    }
    fail('a value (an object, array, string in double quotes, number, true, false or null)');
  };
  try {
    value(0);
    skipSpace();
    if (i < text.length) fail('nothing more after the JSON value');
    return null;
  } catch (e) {
    if (e instanceof Located) return { offset: e.offset, expected: e.expected };
    if (e instanceof RangeError) return null;
    throw e;
  }
}

function lineAndColumn(text: string, offset: number): { line: number; column: number } {
  const before = text.slice(0, offset);
  const line = before.split('\n').length;
  return { line, column: offset - before.lastIndexOf('\n') };
}

function describeAt(text: string, offset: number): string {
  if (offset >= text.length) return 'the end of the input';
  const c = text[offset];
  if (c === '\n' || c === '\r') return 'the end of the line';
  // A bare word (`tru`, `NaN`, a YAML key) reads better whole than by its first letter.
  const word = /[A-Za-z_][A-Za-z0-9_-]*/y;
  word.lastIndex = offset;
  return JSON.stringify(word.exec(text)?.[0] ?? c);
}

/** The line around the mistake, cut to a terminal's width, with a caret under the spot. */
function excerpt(text: string, offset: number): string {
  const start = text.lastIndexOf('\n', offset - 1) + 1;
  const endAt = text.indexOf('\n', offset);
  const line = text.slice(start, endAt < 0 ? text.length : endAt).replace(/\r$/, '').replace(/\t/g, ' ');
  const column = offset - start;
  const width = 72;
  const from = Math.max(0, Math.min(column - width / 2, line.length - width));
  const shown = (from > 0 ? '…' : '') + line.slice(from, from + width) + (from + width < line.length ? '…' : '');
  return `  ${shown}\n  ${' '.repeat(column - from + (from > 0 ? 1 : 0))}^`;
}
