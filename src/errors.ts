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
  constructor(source: string, problems: ConfigProblem[]) {
    const lines = problems.map((p) => `  - ${formatProblem(p)}`);
    super(`${source}: ${problems.length} problem${problems.length === 1 ? '' : 's'} in the setup\n${lines.join('\n')}`);
    this.name = 'ConfigError';
    this.source = source;
    this.problems = problems;
  }
}

export function formatProblem(p: ConfigProblem): string {
  const received = p.received === undefined ? 'nothing' : JSON.stringify(p.received);
  return `Expected ${p.expected} for ${p.path} but received ${received}${p.hint ? ` (${p.hint})` : ''}`;
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
