/** Reading input files, with errors that say what to do. Inputs are only ever read. */
import { readFile } from 'node:fs/promises';
import { ConfigError, InputError } from '../errors.js';

export async function readInputBytes(file: string, what: string): Promise<Uint8Array> {
  try {
    return await readFile(file);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') throw new InputError(file, `${what} does not exist`, 'Check the path; relative paths are taken from the current folder.');
    if (code === 'EISDIR') throw new InputError(file, `${what} is a folder, not a file`, 'Give the path of the file itself.');
    if (code === 'EACCES') throw new InputError(file, `${what} cannot be read (permission denied)`, 'Check the file permissions.');
    throw new InputError(file, `${what} cannot be read (${code ?? (err as Error).message})`, 'Check the path and the file.');
  }
}

/** Reads and parses a JSON setup file; syntax errors become ConfigErrors naming the line and column. */
export async function readSetupJson(file: string): Promise<unknown> {
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw new ConfigError(file, [{ path: '(file)', received: file, expected: code === 'ENOENT' ? 'an existing setup file or a preset name (see `eyeproof presets`)' : `a readable setup file (${code})` }]);
  }
  try {
    return JSON.parse(text);
  } catch (err) {
    const message = (err as Error).message;
    const pos = /position (\d+)/.exec(message);
    let where = '';
    if (pos) {
      const before = text.slice(0, Number(pos[1]));
      const line = before.split('\n').length;
      where = ` at line ${line}, column ${Number(pos[1]) - before.lastIndexOf('\n')}`;
    }
    throw new ConfigError(file, [{ path: '(file)', received: `invalid JSON${where}`, expected: 'valid JSON', hint: message }]);
  }
}
