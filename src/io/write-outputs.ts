/**
 * Writing a set of output files all at once or not at all. The output folder is eyeproof's: it
 * holds only the files of one set. A new set is written into a hidden staging folder beside it,
 * then swapped in — the old folder renamed aside, the staging folder renamed into place, the old
 * one removed — under a journal, so that a run stopped at any moment (even by SIGKILL) leaves the
 * old set or the new one, and the next run finishes or undoes the swap and removes leftovers.
 * Inputs are never written: they are compared by device and inode (so links and symlinks count),
 * and a folder holding anything but eyeproof's outputs is refused.
 */
import { constants, existsSync, readdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { access, mkdir, readdir, realpath, rename, rm, stat, statfs, writeFile } from 'node:fs/promises';
import { basename, dirname, join, resolve } from 'node:path';
import { OutputError } from '../errors.js';

export interface OutputFile {
  name: string;
  bytes: Uint8Array | string;
}

/** File systems that are not for files (process and kernel views): writing there can hang or mislead. */
const SPECIAL_FILE_SYSTEMS = new Map<number, string>([[0x9fa0, 'proc'], [0x62656572, 'sysfs'], [0x1cd1, 'devpts'], [0x01021994, 'tmpfs /dev'], [0x64626720, 'debugfs'], [0x27e0eb, 'cgroup'], [0x63677270, 'cgroup2']]);

/** The names of the hidden siblings of an output folder: staging folders, old sets, the journal and the lock. */
function siblings(target: string): { parent: string; prefix: string; journal: string; lock: string } {
  const parent = dirname(target);
  const prefix = `.${basename(target)}.eyeproof-`;
  return { parent, prefix, journal: join(parent, `${prefix}swap.json`), lock: join(parent, `${prefix}lock`) };
}

/** The nearest existing folder at or above a path, by real path (symlinks resolved). */
async function nearestExisting(path: string): Promise<{ real: string; rest: string[] }> {
  const rest: string[] = [];
  let current = resolve(path);
  for (;;) {
    try {
      return { real: await realpath(current), rest };
    } catch {
      const up = dirname(current);
      if (up === current) return { real: current, rest };
      rest.unshift(basename(current));
      current = up;
    }
  }
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * Finishes or undoes a swap that a stopped run left half done, and removes staging folders and old
 * sets of runs that are no longer alive. Safe to call at any time; called before every write.
 */
export function recoverOutputFolder(dir: string): void {
  const target = resolve(dir);
  const { parent, prefix, journal, lock } = siblings(target);
  if (existsSync(lock)) {
    const pid = Number(readFileSync(lock, 'utf8'));
    if (Number.isFinite(pid) && pid !== process.pid && isAlive(pid)) return;
    rmSync(lock, { force: true });
  }
  if (existsSync(journal)) {
    let entry: { staging?: string; old?: string } = {};
    try {
      entry = JSON.parse(readFileSync(journal, 'utf8'));
    } catch {
      // A journal cut short was written before the swap began: nothing to finish.
    }
    if (!existsSync(target)) {
      if (entry.staging && existsSync(entry.staging)) renameSync(entry.staging, target);
      else if (entry.old && existsSync(entry.old)) renameSync(entry.old, target);
    }
    rmSync(journal, { force: true });
  }
  if (!existsSync(parent)) return;
  for (const name of readdirSync(parent)) {
    if (!name.startsWith(prefix) || name === basename(lock)) continue;
    const m = /-(\d+)-[0-9a-f]+$/.exec(name);
    if (m && Number(m[1]) !== process.pid && isAlive(Number(m[1]))) continue;
    rmSync(join(parent, name), { recursive: true, force: true });
  }
}

/**
 * Checks, before any work, that the set can be written to `dir` without touching an input: the folder
 * is not on a process or kernel file system, holds nothing but eyeproof's outputs, its parent can
 * be written, and no output would be one of the inputs (same device and inode, or the same real
 * path). Creates nothing.
 */
export async function prepareOutputFolder(dir: string, inputs: readonly string[], names: readonly string[], marker?: string): Promise<void> {
  const target = resolve(dir);
  const { real, rest } = await nearestExisting(target);
  try {
    const fs = await statfs(real);
    const special = SPECIAL_FILE_SYSTEMS.get(Number(fs.type));
    if (special || /^\/(proc|sys|dev)(\/|$)/.test(real)) {
      throw new OutputError(dir, `is on the ${special ?? 'system'} file system, not a place for files`, 'Choose an ordinary folder with --out.');
    }
  } catch (err) {
    if (err instanceof OutputError) throw err;
  }
  const existing = await stat(target).catch(() => undefined);
  if (existing && !existing.isDirectory()) throw new OutputError(dir, 'is a file, not a folder', 'Give --out a folder path (it is created if missing).');
  // The folder is swapped as a whole, so it may hold only a set of eyeproof's outputs.
  // A folder holding `marker` (a sweep's sweep.json) is an earlier set of the same kind, replaced whole.
  if (existing && !(marker && existsSync(join(target, marker)))) {
    const foreign = (await readdir(target)).filter((name) => !names.includes(name));
    if (foreign.length) {
      throw new OutputError(dir, `holds files eyeproof did not write (${foreign.slice(0, 3).join(', ')}${foreign.length > 3 ? `, and ${foreign.length - 3} more` : ''})`,
        'Give --out a new or empty folder, or one holding only an earlier proof: the whole folder is replaced by the new set.');
    }
  }
  // Inputs by device and inode and by real path: a link or symlink to an output is still that output.
  const realTarget = existing ? await realpath(target) : join(real, ...rest);
  for (const input of inputs) {
    const inputStat = await stat(input).catch(() => undefined);
    const inputReal = await realpath(input).catch(() => resolve(input));
    if (inputReal === realTarget || inputReal.startsWith(`${realTarget}/`)) {
      throw new OutputError(dir, `holds an input (${input})`, 'Choose another output folder with --out; eyeproof never overwrites its inputs.');
    }
    for (const name of names) {
      const out = join(realTarget, name);
      const outStat = await stat(out).catch(() => undefined);
      if (inputReal === out || (inputStat && outStat && inputStat.dev === outStat.dev && inputStat.ino === outStat.ino)) {
        throw new OutputError(join(dir, name), `would overwrite an input file (${input})`, 'Choose another output folder with --out; eyeproof never overwrites its inputs.');
      }
    }
  }
  try {
    await access(dirname(realTarget) === realTarget ? realTarget : existing ? dirname(realTarget) : real, constants.W_OK);
  } catch (err) {
    throw new OutputError(dir, `cannot be written (${(err as NodeJS.ErrnoException).code ?? (err as Error).message})`, 'Choose a folder you can write to with --out, or fix its permissions.');
  }
}

/** What a write in progress must undo if the process is told to stop (SIGINT, SIGTERM). */
let inProgress: { staging: string; lock: string; swapped: boolean } | undefined;

/** Undoes an unfinished write synchronously (for signal handlers); returns whether the new set was already in place. */
export function abandonWrite(): boolean | undefined {
  if (!inProgress) return undefined;
  const { staging, lock, swapped } = inProgress;
  if (!swapped) rmSync(staging, { recursive: true, force: true });
  rmSync(lock, { force: true });
  inProgress = undefined;
  return swapped;
}

/**
 * Writes the set into a staging folder beside `dir` and swaps it in; returns the paths written. On
 * failure the old set stays (or comes back) and the error says so.
 */
export async function writeOutputsAtomically(dir: string, files: readonly OutputFile[]): Promise<string[]> {
  const target = resolve(dir);
  recoverOutputFolder(target);
  const { parent, prefix, journal, lock } = siblings(target);
  const tag = `${process.pid}-${Math.floor(Math.random() * 2 ** 32).toString(16)}`;
  const staging = join(parent, `${prefix}new-${tag}`);
  const old = join(parent, `${prefix}old-${tag}`);
  try {
    await mkdir(parent, { recursive: true });
    writeFileSync(lock, String(process.pid), { flag: 'wx' });
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw new OutputError(dir, code === 'EEXIST' ? 'is being written by another eyeproof run' : `cannot be written (${code ?? (err as Error).message})`,
      code === 'EEXIST' ? 'Wait for the other run to finish, or give another --out.' : 'Choose a folder you can write to with --out, or fix its permissions.');
  }
  inProgress = { staging, lock, swapped: false };
  let stage = 'writing the new files';
  try {
    await mkdir(staging);
    for (const file of files) {
      const path = join(staging, file.name);
      // Nested names (a sweep's <frame>/<viewer>/…) stay inside the staging folder.
      if (!resolve(path).startsWith(`${resolve(staging)}/`)) throw new Error(`output name ${file.name} leaves the output folder`);
      await mkdir(dirname(path), { recursive: true });
      await writeFile(path, file.bytes);
    }
    stage = 'swapping the new set in';
    await writeFile(`${journal}.tmp`, JSON.stringify({ staging, old }));
    await rename(`${journal}.tmp`, journal);
    const hadOld = existsSync(target);
    if (hadOld) await rename(target, old);
    try {
      await rename(staging, target);
    } catch (err) {
      if (hadOld) await rename(old, target);
      throw err;
    }
    inProgress.swapped = true;
    // The new set is in place; what remains is tidying, which the next run repeats if it fails here.
    await rm(journal, { force: true }).catch(() => {});
    await rm(old, { recursive: true, force: true }).catch(() => {});
    return files.map((f) => join(dir, f.name));
  } catch (err) {
    await rm(staging, { recursive: true, force: true });
    await rm(journal, { force: true });
    const kept = existsSync(target) ? 'the earlier outputs there are unchanged' : 'nothing is there';
    throw new OutputError(dir, `could not be written while ${stage} (${(err as NodeJS.ErrnoException).code ?? (err as Error).message}); ${kept}`, 'Check free disk space and permissions of the output folder and its parent.');
  } finally {
    rmSync(lock, { force: true });
    inProgress = undefined;
  }
}

/** True when a folder holds exactly the named files (a complete set). */
export function holdsCompleteSet(dir: string, names: readonly string[]): boolean {
  try {
    const present = readdirSync(dir).sort();
    return present.length === names.length && [...names].sort().every((n, i) => present[i] === n && statSync(join(dir, n)).isFile());
  } catch {
    return false;
  }
}

/**
 * Writes one new file (a labels file for the user to edit): refused when it exists (unless
 * `replace`), when it is one of the inputs (by device and inode), or under a special file system;
 * written beside its target and renamed into place, so it is whole or absent.
 */
export function writeNewFile(path: string, text: string, inputs: readonly string[], replace: boolean): void {
  const target = resolve(path);
  if (existsSync(target)) {
    const s = statSync(target);
    const isInput = inputs.some((i) => {
      try {
        const t = statSync(i);
        return t.dev === s.dev && t.ino === s.ino;
      } catch {
        return false;
      }
    });
    if (isInput) throw new OutputError(path, 'is one of the inputs', 'Name another file with --out.');
    if (!s.isFile()) throw new OutputError(path, 'exists and is not a regular file', 'Name another file with --out.');
    if (!replace) throw new OutputError(path, 'exists already', 'Correct that file, name another with --out, or pass --force to replace it.');
  }
  if (!existsSync(dirname(target))) throw new OutputError(path, 'is in a folder that does not exist', 'Create the folder first or name another file with --out.');
  const staging = join(dirname(target), `.${basename(target)}.eyeproof-${process.pid}.tmp`);
  try {
    writeFileSync(staging, text, { flag: 'wx' });
    renameSync(staging, target);
  } catch (err) {
    rmSync(staging, { force: true });
    throw new OutputError(path, `could not be written (${(err as NodeJS.ErrnoException).code ?? String(err)})`, 'Check the folder is writable and has space.');
  }
}
