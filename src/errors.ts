/**
 * Typed errors. Each carries what the user needs to fix the problem; only cli/ turns them into
 * messages and exit codes.
 */

/** One problem found in a setup: where it is, what was found and what is allowed. */
export interface ConfigProblem {
  /** JSON path of the field, e.g. `display.viewingDistanceMm`. */
  path: string;
  /** What was received, as the user wrote it. */
  received: unknown;
  /** What is allowed, e.g. `a number from 100 to 20000`. */
  expected: string;
  /** Optional hint, e.g. the nearest valid key for an unknown key. */
  hint?: string;
}

export class ConfigError extends Error {
  readonly source: string;
  readonly problems: ConfigProblem[];
  constructor(source: string, found: ConfigProblem[]) {
    // A problem reached by two routes (e.g. a headset's lens checked twice) is told once.
    const seen = new Set<string>();
    const problems = found.filter((p) => {
      const key = `${p.path}|${p.expected}`;
      if (seen.has(key)) return false;
      seen.add(key);
      return true;
    });
    const lines = problems.map((p) => `  - ${formatProblem(p)}`);
    super(`${source}: ${problems.length} problem${problems.length === 1 ? '' : 's'} in the setup\n${lines.join('\n')}`);
    this.name = 'ConfigError';
    this.source = source;
    this.problems = problems;
  }
}

export function formatProblem(p: ConfigProblem): string {
  const received = p.received === undefined ? 'nothing' : summarise(p.received);
  return `Expected ${p.expected} for ${clip(p.path, 120)} but received ${received}${p.hint ? ` (${clip(p.hint, 300)})` : ''}`;
}

const clip = (text: string, max: number): string => (text.length > max ? `${text.slice(0, max)}… (${text.length} characters)` : text);

/**
 * A value as JSON-like text for a message, bounded in depth (3), entries (5 per object or array)
 * and length (200 characters), so a hostile value cannot flood the terminal or overflow the stack.
 */
export function summarise(value: unknown, depth = 0): string {
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : `${value} (beyond the range of numbers)`;
  if (typeof value === 'string') return JSON.stringify(clip(value, 80));
  if (value === null || typeof value === 'boolean') return String(value);
  if (typeof value !== 'object') return typeof value;
  if (depth >= 3) return Array.isArray(value) ? '[…]' : '{…}';
  const text = Array.isArray(value)
    ? `[${value.slice(0, 5).map((v) => summarise(v, depth + 1)).join(', ')}${value.length > 5 ? `, … (${value.length} items)` : ''}]`
    : (() => {
      const keys = Object.keys(value);
      return `{${keys.slice(0, 5).map((k) => `${JSON.stringify(clip(k, 40))}: ${summarise((value as Record<string, unknown>)[k], depth + 1)}`).join(', ')}${keys.length > 5 ? `, … (${keys.length} keys)` : ''}}`;
    })();
  return clip(text, 200);
}

/** An error about one file, with what went wrong and how to fix it. */
abstract class FileError extends Error {
  readonly file: string;
  readonly fix: string;
  constructor(file: string, what: string, fix: string) {
    super(`${file}: ${what}`);
    this.file = file;
    this.fix = fix;
  }
}

/** A frame, depth map or labels file that cannot be read or understood. */
export class InputError extends FileError {
  override readonly name = 'InputError';
}

/** An output folder or file that cannot be written. */
export class OutputError extends FileError {
  override readonly name = 'OutputError';
}
