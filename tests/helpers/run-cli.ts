/** Runs the eyeproof command (from source, through tsx) as a child process, as a user would. */
import { execFile } from 'node:child_process';
import { join } from 'node:path';

export const ROOT = join(import.meta.dirname, '..', '..');

export function runEyeproof(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    execFile(process.execPath, ['--import', 'tsx', join(ROOT, 'cli/eyeproof.ts'), ...args], { cwd: ROOT, maxBuffer: 1 << 24 }, (err, stdout, stderr) => {
      resolve({ code: err ? (typeof err.code === 'number' ? err.code : 1) : 0, stdout, stderr });
    });
  });
}
