#!/usr/bin/env node
/**
 * The eyeproof command's entry: runs it on the process's arguments and streams. SIGINT and SIGTERM
 * undo a write in progress (the earlier outputs stay, or the new set is complete) and exit with
 * 128 + the signal's number, saying which. A command that stops on its own (serve) takes them instead.
 */
import { abandonWrite } from '../src/io/write-outputs.js';
import { runCli } from './program.js';
import { signalHandler } from './signals.js';

for (const [signal, code] of [['SIGINT', 130], ['SIGTERM', 143]] as const) {
  process.on(signal, () => {
    const own = signalHandler();
    if (own) {
      own(signal);
      return;
    }
    const swapped = abandonWrite();
    const state = swapped === undefined ? 'nothing was written' : swapped ? 'the new outputs were already complete and are in place' : 'the output folder keeps its earlier contents';
    process.stderr.write(`\neyeproof: stopped by ${signal}; ${state}.\n`);
    process.exit(code);
  });
}

process.exitCode = await runCli(process.argv.slice(2));
