/**
 * Reading the JSON of setups and labels files with jsonc-parser (Microsoft's parser for editor
 * configuration files): comments and trailing commas are allowed, as editors allow them; syntax
 * errors and duplicate keys are reported with their line and column; a UTF-8 byte-order mark is
 * skipped; nesting deeper than MAX_JSON_DEPTH and numbers beyond the double range are refused.
 */
import { type ParseError, printParseErrorCode, visit } from 'jsonc-parser';

/** Deepest nesting of objects and arrays a setup or labels file may have. */
export const MAX_JSON_DEPTH = 32;

export interface JsonProblem {
  line: number;
  column: number;
  /** What is allowed there, and what was found. */
  expected: string;
  found: string;
  /** The key's path, for duplicate keys and out-of-range numbers. */
  path?: string;
}

export type JsonResult = { value: unknown; problems: [] } | { value?: undefined; problems: JsonProblem[] };

function lineAndColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let last = -1;
  for (let i = 0; i < offset && i < text.length; i++) {
    if (text.charCodeAt(i) === 10) {
      line++;
      last = i;
    }
  }
  return { line, column: offset - last };
}

/** What the parser wanted where it stopped, in words. */
const SYNTAX_EXPECTED: Record<string, string> = {
  InvalidSymbol: 'a JSON value (an object, array, string, number, true, false or null)',
  InvalidNumberFormat: 'a number',
  PropertyNameExpected: 'a key in double quotes',
  ValueExpected: 'a value',
  ColonExpected: 'a ":" after the key',
  CommaExpected: 'a "," between entries',
  CloseBraceExpected: 'a "}" closing the object',
  CloseBracketExpected: 'a "]" closing the array',
  EndOfFileExpected: 'the end of the file (one value only)',
  InvalidCommentToken: 'a comment started with // or /*',
  UnexpectedEndOfComment: 'a */ closing the comment',
  UnexpectedEndOfString: 'a closing double quote',
  UnexpectedEndOfNumber: 'the rest of the number',
  InvalidUnicode: 'a \\u escape with four hex digits',
  InvalidEscapeCharacter: 'a valid escape (\\n, \\", \\\\ …)',
  InvalidCharacter: 'a character allowed in a string (control characters must be escaped)',
};

const pathText = (path: (string | number)[]): string => path.map((p, i) => (typeof p === 'number' ? `[${p}]` : i === 0 ? p : `.${p}`)).join('') || '(top level)';

/** Offset where nesting first goes deeper than `max` (outside strings and comments), or −1. */
function tooDeepAt(text: string, max: number): number {
  let depth = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (c === '"') {
      for (i++; i < text.length && text[i] !== '"'; i++) if (text[i] === '\\') i++;
    } else if (c === '/' && text[i + 1] === '/') {
      while (i < text.length && text[i] !== '\n') i++;
    } else if (c === '/' && text[i + 1] === '*') {
      const end = text.indexOf('*/', i + 2);
      i = end < 0 ? text.length : end + 1;
    } else if (c === '{' || c === '[') {
      if (++depth > max) return i;
    } else if (c === '}' || c === ']') {
      depth--;
    }
  }
  return -1;
}

/** Parses JSON text (with comments) into a value, or the problems found, each with its place. */
export function parseJson(input: string): JsonResult {
  const text = input.charCodeAt(0) === 0xfeff ? input.slice(1) : input;
  const problems: JsonProblem[] = [];
  const at = (offset: number): { line: number; column: number } => lineAndColumn(text, offset);
  // Deep nesting is refused before parsing (the parser recurses per level).
  const deep = tooDeepAt(text, MAX_JSON_DEPTH);
  if (deep >= 0) return { problems: [{ ...at(deep), expected: `objects and arrays nested at most ${MAX_JSON_DEPTH} deep`, found: 'deeper nesting' }] };
  // One pass builds the value, watching depth, duplicate keys and numbers.
  const stack: { container: Record<string, unknown> | unknown[]; keys?: Set<string> }[] = [];
  let root: unknown;
  let pendingKey: string | undefined;
  const put = (value: unknown): void => {
    const top = stack[stack.length - 1];
    if (!top) root = value;
    else if (Array.isArray(top.container)) top.container.push(value);
    else if (pendingKey !== undefined) Object.defineProperty(top.container, pendingKey, { value, enumerable: true, writable: true, configurable: true });
    pendingKey = undefined;
  };
  const open = (container: Record<string, unknown> | unknown[]): void => {
    put(container);
    stack.push({ container, keys: Array.isArray(container) ? undefined : new Set() });
  };
  const errors: ParseError[] = [];
  visit(text, {
    onObjectBegin: () => open({}),
    onObjectEnd: () => { stack.pop(); },
    onArrayBegin: () => open([]),
    onArrayEnd: () => { stack.pop(); },
    onObjectProperty: (property, offset, _length, _line, _column, pathSupplier) => {
      const top = stack[stack.length - 1];
      if (top?.keys?.has(property)) problems.push({ ...at(offset), path: pathText([...pathSupplier(), property]), expected: 'each key once in an object', found: `"${property.slice(0, 40)}" a second time` });
      top?.keys?.add(property);
      pendingKey = property;
    },
    onLiteralValue: (value, offset, length, _line, _column, pathSupplier) => {
      if (typeof value === 'number' && !Number.isFinite(value)) {
        problems.push({ ...at(offset), path: pathText(pathSupplier()), expected: 'a number within ±1.8 × 10^308', found: text.slice(offset, offset + Math.min(length, 40)) });
      }
      put(value);
    },
    onError: (error, offset) => {
      errors.push({ error, offset, length: 0 });
    },
  }, { allowTrailingComma: true, disallowComments: false });
  // The first syntax error only: the ones after it mostly follow from it.
  // An unquoted key is first an invalid symbol, then a missing key: the second says it better.
  const first = errors[0];
  if (first) {
    const second = errors[1];
    const code = printParseErrorCode(first.error) === 'InvalidSymbol' && second && printParseErrorCode(second.error) === 'PropertyNameExpected' ? 'PropertyNameExpected' : printParseErrorCode(first.error);
    const snippet = text.slice(first.offset, first.offset + 12).split('\n')[0];
    problems.push({ ...at(first.offset), expected: SYNTAX_EXPECTED[code] ?? 'valid JSON', found: snippet || 'the end of the file' });
  }
  if (problems.length) return { problems };
  return { value: root, problems: [] };
}

/** The problems as one line each: "line 3, column 7: …". */
export function describeJsonProblems(problems: readonly JsonProblem[]): string[] {
  return problems.map((p) => `line ${p.line}, column ${p.column}${p.path ? ` (${p.path})` : ''}: expected ${p.expected}, found ${p.found}`);
}
