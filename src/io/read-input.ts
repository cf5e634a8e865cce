/** Reading input files, with errors that say what to do. Inputs are only ever read. */
import { constants } from 'node:fs';
import { open } from 'node:fs/promises';
import { ConfigError, InputError } from '../errors.js';
import { parseJson } from './parse-json.js';

/** Largest frame or depth-map file read, bytes. */
export const MAX_IMAGE_FILE_BYTES = 256 * 2 ** 20;
/** Largest setup, viewer or labels file read, bytes. */
export const MAX_JSON_FILE_BYTES = 8 * 2 ** 20;

/**
 * Reads an input file: only a regular file (not a folder, pipe, device or socket) of at most
 * `maxBytes`. It is opened without blocking, so a pipe given as a file is refused, not waited on.
 */
export async function readInputBytes(file: string, what: string, maxBytes = MAX_IMAGE_FILE_BYTES): Promise<Uint8Array> {
  let handle;
  try {
    handle = await open(file, constants.O_RDONLY | constants.O_NONBLOCK);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') throw new InputError(file, `${what} does not exist`, 'Check the path; relative paths are taken from the current folder.');
    if (code === 'EISDIR') throw new InputError(file, `${what} is a folder, not a file`, 'Give the path of the file itself.');
    if (code === 'EACCES') throw new InputError(file, `${what} cannot be read (permission denied)`, 'Check the file permissions.');
    throw new InputError(file, `${what} cannot be read (${code ?? (err as Error).message})`, 'Check the path and the file.');
  }
  try {
    const info = await handle.stat();
    if (info.isDirectory()) throw new InputError(file, `${what} is a folder, not a file`, 'Give the path of the file itself.');
    if (!info.isFile()) throw new InputError(file, `${what} is not a regular file (a pipe, device or socket)`, 'Save it to a file first and give that file.');
    if (info.size > maxBytes) throw new InputError(file, `${what} is ${(info.size / 2 ** 20).toFixed(1)} MB, above the ${(maxBytes / 2 ** 20).toFixed(0)} MB eyeproof reads`, 'Give a smaller file (export the frame at the display\'s resolution as PNG, JPEG or WebP).');
    const bytes = new Uint8Array(info.size);
    let read = 0;
    while (read < info.size) {
      const { bytesRead } = await handle.read(bytes, read, info.size - read, read);
      if (bytesRead === 0) break;
      read += bytesRead;
    }
    return read === info.size ? bytes : bytes.subarray(0, read);
  } catch (err) {
    if (err instanceof InputError) throw err;
    const code = (err as NodeJS.ErrnoException).code;
    throw new InputError(file, `${what} cannot be read (${code ?? (err as Error).message})`, 'Check the path and the file.');
  } finally {
    await handle.close();
  }
}

/** Reads and parses a JSON setup file (comments allowed); problems become ConfigErrors naming line and column. */
export async function readSetupJson(file: string): Promise<unknown> {
  let text: string;
  try {
    text = new TextDecoder().decode(await readInputBytes(file, 'the setup file', MAX_JSON_FILE_BYTES));
  } catch (err) {
    if (err instanceof InputError) throw new ConfigError(file, [{ path: '(file)', received: file, expected: 'an existing, readable setup file of at most 1 MB, or a preset name (see `eyeproof presets`)', hint: err.message }]);
    throw err;
  }
  const parsed = parseJson(text);
  if (parsed.problems.length) {
    throw new ConfigError(file, parsed.problems.map((p) => ({
      path: `${p.path ? `${p.path} at ` : ''}line ${p.line}, column ${p.column}`,
      received: p.found,
      expected: p.expected,
    })));
  }
  return parsed.value;
}
