/**
 * Writing a set of output files all-or-nothing: each goes to a temporary file beside its target
 * and is renamed into place only when every file has been written; on failure nothing is left.
 */
import { constants } from 'node:fs';
import { access, mkdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { OutputError } from '../errors.js';

export interface OutputFile {
  name: string;
  bytes: Uint8Array | string;
}

/** Fails early, before any work, if the folder cannot be created or written, or would overwrite an input. */
export async function prepareOutputFolder(dir: string, inputs: readonly string[], names: readonly string[]): Promise<void> {
  const target = resolve(dir);
  for (const input of inputs) {
    for (const name of names) {
      if (resolve(input) === join(target, name)) {
        throw new OutputError(join(dir, name), 'would overwrite an input file', 'Choose another output folder with --out; eyeproof never overwrites its inputs.');
      }
    }
  }
  try {
    const s = await stat(target).catch(() => undefined);
    if (s && !s.isDirectory()) throw new OutputError(dir, 'is a file, not a folder', 'Give --out a folder path (it is created if missing).');
    if (!s) await mkdir(target, { recursive: true });
    await access(target, constants.W_OK);
  } catch (err) {
    if (err instanceof OutputError) throw err;
    throw new OutputError(dir, `cannot be written (${(err as NodeJS.ErrnoException).code ?? (err as Error).message})`, 'Choose a folder you can write to with --out, or fix its permissions.');
  }
}

export async function writeOutputsAtomically(dir: string, files: readonly OutputFile[]): Promise<string[]> {
  const suffix = `.${process.pid}.${Date.now()}.tmp`;
  const temps: string[] = [];
  try {
    for (const file of files) {
      const temp = join(dir, file.name + suffix);
      temps.push(temp);
      await writeFile(temp, file.bytes);
    }
    const written: string[] = [];
    for (const file of files) {
      await rename(join(dir, file.name + suffix), join(dir, file.name));
      written.push(join(dir, file.name));
    }
    return written;
  } catch (err) {
    await Promise.all(temps.map((t) => rm(t, { force: true })));
    throw new OutputError(dir, `could not be written (${(err as NodeJS.ErrnoException).code ?? (err as Error).message})`, 'Check free disk space and permissions of the output folder.');
  }
}
