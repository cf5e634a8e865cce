/** The eyeproof command: parses, calls the library, prints, and picks the exit code — nothing else. */
import { existsSync } from 'node:fs';
import { Command, CommanderError, InvalidArgumentError, Option } from 'commander';
import { closest } from 'fastest-levenshtein';
import { ConfigError, InputError, OutputError } from '../src/errors.js';
import { displayPresets, viewerPresets } from '../src/config/presets.js';
import { setupJsonSchema } from '../src/config/schema.js';
import { mergeSetupJson, validateSetup } from '../src/config/validate.js';
import type { Setup } from '../src/config/setup.js';
import { MAX_JSON_FILE_BYTES, readInputBytes, readSetupJson } from '../src/io/read-input.js';
import { BYTES_PER_FRAME_PIXEL, DEFAULT_MAX_FRAME_PIXELS, MAX_FRAME_PIXELS, probeImage } from '../src/io/decode-frame.js';
import { labelsFromSvg } from '../src/io/read-svg-text.js';
import { prepareOutputFolder, writeNewFile, writeOutputsAtomically } from '../src/io/write-outputs.js';
import { basename } from 'node:path';
import { computeNumbers, sizeSpec } from '../src/pipeline.js';
import { formatSizes, type SizesFormat } from './format-sizes.js';
import { startPreviewServer } from '../src/serve/preview-server.js';
import { takeSignals } from './signals.js';
import { expandPlan, readPlan } from '../src/batch/plan.js';
import { runPlanLocally, writeIndex } from '../src/batch/local.js';
import { enqueuePlan, planStatus, queueName, startQueueWorker } from '../src/batch/queue.js';
import { acuityModels } from '../src/retina/acuity-model.js';
import { detectLabelsInFrame, proofFrame, PROOF_OUTPUT_NAMES, type ProofInputs } from '../src/proof.js';
import { runSweep, SWEEP_FILES, type SweepFrame, type SweepVariant } from '../src/sweep.js';
import type { DepthUnit } from '../src/io/decode-depth.js';
import { describeVerdicts, numbersReport } from '../src/report/build-report.js';
import { GAZE_FORMS, isPlainPixels } from '../src/geometry/gaze-spec.js';
import { formatLabelSummary } from './format-labels.js';
import { CAUTION_SHORT } from '../src/report/cautions.js';
import { EXIT } from './exit-codes.js';
import { EYEPROOF_VERSION } from '../src/version.js';
import { formatNumbersTable } from './format-numbers.js';

interface SetupOptions {
  setup?: string;
  viewer?: string;
  gaze?: string;
  acuityModel?: string;
  perceptMode?: string;
  referenceViewer?: string;
}

type Json = Record<string, unknown>;

/** Where the command writes: the process's streams, or a test's collectors. */
export interface CliIo {
  out(text: string): void;
  err(text: string): void;
}

const processIo: CliIo = { out: (t) => process.stdout.write(t), err: (t) => process.stderr.write(t) };

/** Builds the setup from presets, files and flags; returns it with a name for messages. */
async function resolveSetup(opts: SetupOptions, quick: { ageYears?: number; viewingDistanceMm?: number } = {}): Promise<{ setup: Setup; source: string }> {
  let raw: Json = {};
  const sources: string[] = [];
  if (opts.setup) {
    if (displayPresets.some((p) => p.name === opts.setup)) raw = { display: { preset: opts.setup } };
    else if (existsSync(opts.setup) || /\.json$/i.test(opts.setup)) raw = (await readSetupJson(opts.setup)) as Json;
    else {
      throw new ConfigError('--setup', [{ path: '--setup', received: opts.setup, expected: `a setup file or one of the display presets ${displayPresets.map((p) => p.name).join(', ')}`, hint: `did you mean "${closest(opts.setup, displayPresets.map((p) => p.name))}"?` }]);
    }
    sources.push(opts.setup);
  }
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) return { setup: validateSetup(raw, opts.setup ?? 'setup'), source: opts.setup ?? 'setup' };
  const over: Json = {};
  if (opts.viewer) {
    if (viewerPresets.some((p) => p.name === opts.viewer)) over.viewer = { preset: opts.viewer };
    else if (existsSync(opts.viewer) || /\.json$/i.test(opts.viewer)) {
      const v = (await readSetupJson(opts.viewer)) as Json;
      over.viewer = v && typeof v === 'object' && Object.hasOwn(v, 'viewer') ? v.viewer : v;
    } else {
      throw new ConfigError('--viewer', [{ path: '--viewer', received: opts.viewer, expected: `a viewer file or one of the viewer presets ${viewerPresets.map((p) => p.name).join(', ')}`, hint: `did you mean "${closest(opts.viewer, viewerPresets.map((p) => p.name))}"?` }]);
    }
    sources.push(opts.viewer);
  }
  if (opts.gaze !== undefined && isPlainPixels(opts.gaze)) {
    const [x, y] = opts.gaze.split(',').map(Number);
    over.gaze = { xPx: x, yPx: y };
  }
  if (opts.acuityModel) over.models = { acuity: opts.acuityModel };
  if (opts.perceptMode || opts.referenceViewer) {
    const percept: Json = {};
    if (opts.perceptMode) percept.mode = opts.perceptMode;
    if (opts.referenceViewer) {
      if (viewerPresets.some((p) => p.name === opts.referenceViewer)) percept.referenceViewer = opts.referenceViewer;
      else if (existsSync(opts.referenceViewer) || /\.json$/i.test(opts.referenceViewer)) {
        const v = (await readSetupJson(opts.referenceViewer)) as Json;
        percept.referenceViewer = v && typeof v === 'object' && Object.hasOwn(v, 'viewer') ? v.viewer : v;
        sources.push(opts.referenceViewer);
      } else {
        throw new ConfigError('--reference-viewer', [{ path: '--reference-viewer', received: opts.referenceViewer, expected: `a viewer file or one of the viewer presets ${viewerPresets.map((p) => p.name).join(', ')}`, hint: `did you mean "${closest(opts.referenceViewer, viewerPresets.map((p) => p.name))}"?` }]);
      }
    }
    over.percept = percept;
  }
  const merged = mergeSetupJson(raw, over);
  // A viewer given by flag replaces the file's viewer rather than merging into it.
  if (over.viewer) merged.viewer = over.viewer;
  // Quick flags (--age, --distance) change one value of the viewer or display, whatever gave them.
  if (quick.ageYears !== undefined) merged.viewer = { ...((merged.viewer as Json | undefined) ?? {}), ageYears: quick.ageYears };
  if (quick.viewingDistanceMm !== undefined) merged.display = { ...((merged.display as Json | undefined) ?? { preset: 'desktop-27in' }), viewingDistanceMm: quick.viewingDistanceMm };
  if (quick.ageYears !== undefined) sources.push(`--age ${quick.ageYears}`);
  if (quick.viewingDistanceMm !== undefined) sources.push(`--distance ${quick.viewingDistanceMm}`);
  const source = sources.length ? sources.join(' + ') : 'built-in defaults';
  const setup = validateSetup(merged, source);
  if (opts.perceptMode) setup.percept.modeFrom = 'command line';
  return { setup, source };
}

function progress(io: CliIo, quiet: boolean): (stage: string) => void {
  const start = performance.now();
  return (stage) => {
    if (!quiet) io.err(`eyeproof: ${stage}… (${((performance.now() - start) / 1000).toFixed(1)} s)\n`);
  };
}

/** --audience: a share of the audience in percent, above 0 and at most 100. */
function percentOf(text: string): number {
  const value = Number(text.replace(/%$/, ''));
  if (!Number.isFinite(value) || value <= 0 || value > 100) throw new InvalidArgumentError('expected a share of the audience in percent, above 0 and at most 100 (e.g. 90)');
  return value;
}

/** --cap-height-ratio family=ratio, repeatable: capital height per em by font family. */
function collectRatios(text: string, previous: Record<string, number>): Record<string, number> {
  const m = /^(.+)=\s*([\d.]+)$/.exec(text);
  const ratio = m ? Number(m[2]) : NaN;
  if (!m || !(ratio > 0.3 && ratio < 1)) throw new InvalidArgumentError('expected family=ratio with a capital height per em from 0.3 to 1, e.g. "Inter=0.727"');
  return { ...previous, [m[1].trim().toLowerCase()]: ratio };
}

/** A whole number from 1 to `max`. */
function positiveInt(text: string, max: number): number {
  const value = Number(text);
  if (!Number.isInteger(value) || value < 1 || value > max) throw new InvalidArgumentError(`expected a whole number from 1 to ${max}`);
  return value;
}

/** Some batch jobs failed (after the others ran and the index was written). */
class BatchFailed extends Error {
  constructor(readonly count: number) {
    super(`${count} batch jobs failed`);
  }
}

/** --port: 0 (any free port) to 65535. */
function portNumber(text: string): number {
  const value = Number(text);
  if (!Number.isInteger(value) || value < 0 || value > 65535) throw new InvalidArgumentError('expected a port number from 0 to 65535 (0: any free port)');
  return value;
}

/** --max-pixels: a whole number of pixels up to what the decoder may open. */
function pixelCount(text: string): number {
  const value = Number(text);
  if (!Number.isInteger(value) || value < 1 || value > MAX_FRAME_PIXELS) {
    throw new InvalidArgumentError(`expected a whole number of pixels from 1 to ${MAX_FRAME_PIXELS}`);
  }
  return value;
}

function addSetupOptions(cmd: Command): Command {
  return cmd
    .option('-s, --setup <preset|file>', 'display preset name or setup JSON file (default: desktop-27in)')
    .option('-v, --viewer <preset|file>', 'viewer preset name or viewer JSON file (default: age-25)')
    .option('-g, --gaze <where>', `where the viewer looks (default: the frame centre): ${GAZE_FORMS}`)
    .addOption(new Option('--acuity-model <name>', 'acuity model').choices(['rgc-sampling', 'contrast-threshold']))
    .addOption(new Option('--percept-mode <mode>', 'what percept.png shows: same-display (default for screens) or retinal-image (default for headsets)').choices(['same-display', 'retinal-image']))
    .option('--reference-viewer <preset|file>', 'who looks at a same-display percept (default: age-25)');
}

type ProofOpts = SetupOptions & { labels?: string; depth?: string; depthUnit: DepthUnit; maxPixels?: number; detectLabels: boolean; capHeightRatio: Record<string, number>; age?: string; distance?: string; gaze?: string; out: string };

/** A comma list of numbers for --age or --distance, each within a range. */
function numberList(text: string | undefined, flag: string, lo: number, hi: number, unit: string): number[] | undefined {
  if (text === undefined) return undefined;
  const values = text.split(',').map((t) => Number(t.trim()));
  if (values.length === 0 || values.length > 12 || values.some((v) => !Number.isFinite(v) || v < lo || v > hi)) {
    throw new ConfigError(flag, [{ path: flag, received: text, expected: `a number from ${lo} to ${hi} ${unit}, or a comma list of up to 12 of them` }]);
  }
  return values;
}

/** The viewers (and distances) of a run: one, or the product of --viewer a,b × --age × --distance. */
async function resolveVariants(opts: ProofOpts): Promise<SweepVariant[]> {
  const viewers = opts.viewer ? opts.viewer.split(',').map((v) => v.trim()).filter(Boolean) : [undefined];
  const ages = numberList(opts.age, '--age', 1, 100, 'years') ?? [undefined];
  const distances = numberList(opts.distance, '--distance', 50, 20000, 'mm') ?? [undefined];
  const out: SweepVariant[] = [];
  for (const viewer of viewers) {
    for (const age of ages) {
      for (const distance of distances) {
        const { setup, source } = await resolveSetup({ ...opts, viewer }, { ...(age !== undefined ? { ageYears: age } : {}), ...(distance !== undefined ? { viewingDistanceMm: distance } : {}) });
        const name = [setup.presetNames.viewer && age === undefined ? setup.presetNames.viewer : `age-${setup.viewer.ageYears}`, ...(distance !== undefined ? [`${distance}mm`] : [])].join('-')
          .replace(/[^A-Za-z0-9._-]/g, '_');
        out.push({ name: out.some((o) => o.name === name) ? `${name}-${out.length + 1}` : name, setup, source });
      }
    }
  }
  return out;
}

/** A frame's bytes and the inputs that go with it: labels beside it or given, depth map, gaze. */
async function readFrameInputs(frame: string, opts: ProofOpts): Promise<{ bytes: Uint8Array; labelsFile?: string; besideFrame: string; inputs: Omit<ProofInputs, 'onStage' | 'onNote'> }> {
  const bytes = await readInputBytes(frame, 'the frame');
  const besideFrame = frame.replace(/\.(png|jpe?g|webp)$/i, '') + '.labels.json';
  const labelsFile = opts.labels ?? (existsSync(besideFrame) ? besideFrame : undefined);
  const labels = labelsFile ? { file: labelsFile, text: new TextDecoder().decode(await readInputBytes(labelsFile, 'the labels file', MAX_JSON_FILE_BYTES)), capHeightRatios: opts.capHeightRatio } : undefined;
  const depth = opts.depth ? { file: opts.depth, bytes: await readInputBytes(opts.depth, 'the depth map'), unit: opts.depthUnit } : undefined;
  return {
    bytes, besideFrame, ...(labelsFile ? { labelsFile } : {}),
    inputs: {
      ...(labels ? { labels } : {}), ...(depth ? { depth } : {}), ...(opts.maxPixels ? { maxPixels: opts.maxPixels } : {}),
      ...(opts.gaze !== undefined && !isPlainPixels(opts.gaze) ? { gaze: opts.gaze } : {}), detectLabels: opts.detectLabels,
    },
  };
}

/** A progress bar on stderr that rewrites one line and ends cleanly. */
function progressBar(io: CliIo, quiet: boolean): { update(done: number, total: number, what: string): void; end(): void } {
  const start = performance.now();
  let drawn = false;
  return {
    update(done, total, what) {
      if (quiet) return;
      const width = 24;
      const filled = Math.round((width * done) / Math.max(1, total));
      const elapsed = (performance.now() - start) / 1000;
      const eta = done > 0 && done < total ? ` · about ${Math.ceil((elapsed / done) * (total - done))} s left` : '';
      io.err(`\r[${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${done}/${total} ${what}${eta}`.padEnd(100).slice(0, 100));
      drawn = true;
    },
    end() {
      if (drawn) io.err('\n');
    },
  };
}

async function runSweepCommand(io: CliIo, frameFiles: string[], variants: SweepVariant[], opts: ProofOpts, quiet: boolean): Promise<void> {
  const frames: SweepFrame[] = [];
  for (const file of frameFiles) {
    const read = await readFrameInputs(file, opts);
    const base = basename(file).replace(/\.[^.]+$/, '').replace(/[^A-Za-z0-9._-]/g, '_') || 'frame';
    frames.push({ file, bytes: read.bytes, name: frames.some((f) => f.name === base) ? `${base}-${frames.length + 1}` : base, inputs: read.inputs });
  }
  const inputs = [...frameFiles, opts.setup, ...(opts.viewer ?? '').split(','), opts.referenceViewer, opts.depth, ...frameFiles.map((f) => f.replace(/\.(png|jpe?g|webp)$/i, '') + '.labels.json')]
    .filter((f): f is string => Boolean(f) && existsSync(f as string));
  await prepareOutputFolder(opts.out, inputs, [...SWEEP_FILES, ...frames.map((f) => f.name)], 'sweep.json');
  const bar = progressBar(io, quiet);
  const notes: string[] = [];
  const { files, done } = await runSweep(frames, variants, (n) => notes.push(n), (d, t, what) => bar.update(d, t, what));
  bar.end();
  for (const n of [...new Set(notes)]) io.err(`eyeproof: note: ${n}\n`);
  await writeOutputsAtomically(opts.out, files);
  if (quiet) return;
  for (const d of done) io.err(`  ${d.frame.name} · ${d.variant.name}: ${d.labels ? describeVerdicts(d.labels) : 'no labels'}\n`);
  io.err(`eyeproof: wrote a sweep of ${done.length} proofs into ${opts.out}/ (contact-sheet.png, ${variants.length > 1 ? 'compare-viewers.png, ' : ''}sweep.html, sweep.json and one folder per frame and viewer)\n`);
}

export function buildProgram(io: CliIo = processIo): Command {
  const program = new Command('eyeproof')
    .description('Shows what a viewer\'s retina receives and resolves when looking at a rendered interface frame.\n' + CAUTION_SHORT)
    .version(EYEPROOF_VERSION)
    .showHelpAfterError()
    .configureOutput({ writeOut: (t) => io.out(t), writeErr: (t) => io.err(t) })
    .exitOverride();

  addSetupOptions(program.command('proof <frames...>'))
    .description('simulate a viewer looking at a frame and judge its text labels; writes percept.png (what the viewer resolves), detail-map.png (smallest legible letter everywhere, with label verdicts), compare.png and compare-slide.png (frame and percept side by side), reach.png (where the gaze may rest for each glance label), audience.png (share of an audience reading each capital height), psf.png (the eye\'s point-spread functions), report.json (every number, verdict and fix) and review.html (all of it on one page). Several frames, viewers (--viewer a,b), ages or distances make a sweep: one folder per frame and viewer, plus contact-sheet.png, compare-viewers.png, sweep.html and sweep.json')
    .option('-o, --out <folder>', 'output folder: created if missing, replaced as a whole, so it may hold only eyeproof outputs', 'eyeproof-out')
    .option('-q, --quiet', 'no progress on stderr')
    .option('--json', 'print report.json on stdout and nothing else (one frame and viewer only)')
    .option('--age <years>', 'viewer age in years, overriding the viewer\'s; a comma list sweeps ages (e.g. 25,45,70)')
    .option('--distance <mm>', 'viewing distance of a screen in mm, overriding the display\'s; a comma list sweeps distances')
    .option('-l, --labels <file>', 'labels file with the text runs to judge, or the frame\'s SVG export (text elements are read) (default: <frame>.labels.json beside the frame, if there is one)')
    .option('--cap-height-ratio <family=ratio...>', 'capital height per em of a font family in an SVG export (default 0.7; the bundled IBM Plex Sans is measured)', collectRatios, {})
    .option('-d, --depth <file>', 'depth map: a 16-bit greyscale PNG of distances from the eye, same size as the frame (0 = none)')
    .addOption(new Option('--depth-unit <unit>', 'unit of the depth map values').choices(['mm', 'cm', 'm']).default('mm'))
    .option('--no-detect-labels', 'without a labels file, do not look for text runs in the frame (by default they are found and judged)')
    .addOption(new Option('--max-pixels <count>', `largest frame to proof, in pixels (default ${DEFAULT_MAX_FRAME_PIXELS}, 3840×2160: a proof needs about ${BYTES_PER_FRAME_PIXEL} bytes of memory per pixel)`).argParser(pixelCount))
    .addHelpText('after', `
Examples:
  $ eyeproof proof sample-scenes/ferry-console.png
  $ eyeproof proof frame.png --setup desktop-27in --viewer age-55 --gaze 1280,720 --out review/
  $ eyeproof proof frame.png --age 60 --distance 800                       # quick viewer and distance
  $ eyeproof proof a.png b.png --viewer age-25,age-70 --gaze labels --out sweep/   # a sweep
  $ eyeproof proof chip.png --setup my-headset.json --viewer myope-2d --acuity-model contrast-threshold
  $ eyeproof proof passthrough.png --setup headset-wide --depth passthrough-depth.png --depth-unit mm`)
    .action(async (frames: string[], opts: SetupOptions & { out: string; quiet?: boolean; json?: boolean; labels?: string; depth?: string; depthUnit: DepthUnit; maxPixels?: number; detectLabels: boolean; capHeightRatio: Record<string, number>; age?: string; distance?: string }) => {
      const variants = await resolveVariants(opts);
      const quiet = Boolean(opts.quiet || opts.json);
      if (frames.length > 1 || variants.length > 1) {
        if (opts.json) throw new CommanderError(2, 'eyeproof.json', 'error: --json is for one frame and one viewer; a sweep writes sweep.json');
        if (opts.labels && frames.length > 1) throw new CommanderError(2, 'eyeproof.labels', 'error: --labels names one frame\'s labels; in a sweep put each frame\'s <frame>.labels.json beside it');
        await runSweepCommand(io, frames, variants, opts, quiet);
        return;
      }
      const [frame] = frames;
      const { setup, source } = variants[0];
      const read = await readFrameInputs(frame, opts);
      const inputs = [frame, opts.setup, opts.viewer, opts.referenceViewer, read.labelsFile, opts.depth].filter((f): f is string => Boolean(f) && existsSync(f as string));
      await prepareOutputFolder(opts.out, inputs, PROOF_OUTPUT_NAMES);
      const notes: string[] = [];
      const { files, report, result, fixations } = await proofFrame(read.bytes, frame, setup, source, { ...read.inputs, onStage: progress(io, quiet), onNote: (n) => notes.push(n) });
      // Notes are said even with --quiet (they change how the result reads), never on stdout.
      if (!opts.json) for (const n of notes) io.err(`eyeproof: note: ${n}\n`);
      const written = await writeOutputsAtomically(opts.out, files);
      if (opts.json) io.out(`${JSON.stringify(report, null, 2)}\n`);
      if (quiet) return;
      if (result.labels) io.err(formatLabelSummary(result.labels, read.labelsFile ?? 'the frame (found, not read back)', fixations));
      else io.err(`eyeproof: no labels, so no verdicts: give a labels file with --labels, or put ${read.besideFrame} beside the frame.\n`);
      io.err(`eyeproof: wrote ${written.join(', ')}\n`);
    });

  program.command('labels <frame>')
    .description('find the text runs in a frame and write them as a labels file to correct (boxes and capital heights; text is not read back)')
    .option('-o, --out <file>', 'labels file to write (default: <frame>.labels.json beside the frame); never overwritten without --force')
    .option('--from-svg <file>', 'read the labels from the frame\'s SVG export (text elements) instead of finding them in the pixels')
    .option('--cap-height-ratio <family=ratio...>', 'capital height per em of a font family in the SVG (default 0.7; the bundled IBM Plex Sans is measured)', collectRatios, {})
    .option('--force', 'replace the labels file if it exists')
    .option('--max-pixels <count>', 'largest frame to read, in pixels', (t) => pixelCount(t))
    .addHelpText('after', `
Example:
  $ eyeproof labels export/cluster.png            # writes export/cluster.labels.json
  $ eyeproof proof export/cluster.png             # uses it once corrected`)
    .action(async (frame: string, opts: { out?: string; force?: boolean; maxPixels?: number; fromSvg?: string; capHeightRatio: Record<string, number> }) => {
      const bytes = await readInputBytes(frame, 'the frame');
      const out = opts.out ?? `${frame.replace(/\.(png|jpe?g|webp)$/i, '')}.labels.json`;
      let json: Record<string, unknown>;
      let count: number;
      if (opts.fromSvg) {
        const probe = await probeImage(bytes, frame);
        const svg = new TextDecoder().decode(await readInputBytes(opts.fromSvg, 'the SVG export', MAX_JSON_FILE_BYTES));
        const labels = labelsFromSvg(svg, opts.fromSvg, probe.width, probe.height, { capHeightRatios: opts.capHeightRatio });
        count = labels.length;
        json = { frame: basename(frame), found: `eyeproof labels: ${count} text elements of ${basename(opts.fromSvg)}; capital heights ${labels.every((l) => l.measured) ? 'measured from the bundled face' : 'estimated from the font size where the face is not bundled'}; give each a role (glance, look, decorative)`, labels: labels.map(({ measured: _m, ...l }) => l) };
      } else {
        const { runs, width, height } = await detectLabelsInFrame(bytes, frame, opts.maxPixels);
        count = runs.length;
        json = { frame: basename(frame), found: `eyeproof labels: ${runs.length} text runs, ${width}×${height} px; correct the boxes and capital heights, give each an id, its text and a role (glance, look, decorative)`, labels: runs.map((r) => ({ id: r.id, text: r.text, characters: r.characters, boxPx: r.boxPx, letterHeightPx: r.letterHeightPx, confidence: r.confidence })) };
      }
      writeNewFile(out, `${JSON.stringify(json, null, 2)}\n`, [frame, ...(opts.fromSvg ? [opts.fromSvg] : [])], Boolean(opts.force));
      io.err(`eyeproof: ${opts.fromSvg ? 'read' : 'found'} ${count} text runs; wrote ${out}\n`);
    });

  addSetupOptions(program.command('numbers'))
    .description('print the derived figures of a setup without a frame: geometry, eye state, acuity by eccentricity')
    .option('--json', 'print JSON (the display, eye and acuity objects of report.json)')
    .addHelpText('after', `
Examples:
  $ eyeproof numbers --setup headset-wide --viewer age-25 --json
  $ eyeproof numbers --setup vehicle-cluster --viewer age-70`)
    .action(async (opts: SetupOptions & { json?: boolean }) => {
      const { setup } = await resolveSetup(opts);
      const numbers = computeNumbers(setup);
      const report = numbersReport(setup, numbers, acuityModels[setup.models.acuity]);
      if (opts.json) io.out(`${JSON.stringify(report, null, 2)}\n`);
      else io.out(formatNumbersTable(setup, numbers));
    });

  addSetupOptions(program.command('sizes'))
    .description('print the smallest capital height and letter spacing that pass at 0, 2, 5, 10 and 20° from the gaze on this display: what a type scale needs')
    .addOption(new Option('--audience <percent>', 'also give the capital height this share of an audience reads (ages 20–75, with and without distance glasses)').argParser(percentOf))
    .addOption(new Option('--format <format>', 'output format').choices(['table', 'markdown', 'json']).default('table'))
    .addHelpText('after', `
Examples:
  $ eyeproof sizes --setup vehicle-cluster --viewer age-70
  $ eyeproof sizes --setup desktop-27in --audience 90 --format markdown`)
    .action(async (opts: SetupOptions & { audience?: number; format: SizesFormat }) => {
      const { setup } = await resolveSetup(opts);
      io.out(formatSizes(setup, sizeSpec(setup, opts.audience), opts.format));
    });

  program.command('serve')
    .description('live preview in the browser: open a frame, click the gaze, change age, refraction, pupil, light and distance')
    .option('--port <port>', 'port to listen on (default: a free one)', (t) => portNumber(t), 0)
    .option('--host <address>', 'address to listen on (default 127.0.0.1: this machine only)', '127.0.0.1')
    .addHelpText('after', `
Example:
  $ eyeproof serve --port 8123        # then open http://127.0.0.1:8123/`)
    .action(async (opts: { port: number; host: string }) => {
      const preview = await startPreviewServer({ host: opts.host, port: opts.port, onWarning: (w) => io.err(`eyeproof: warning: ${w}\n`) });
      io.err(`eyeproof: live preview at ${preview.url} — Ctrl-C to stop\n`);
      await new Promise<void>((resolve) => {
        takeSignals((signal) => {
          io.err(`eyeproof: ${signal}: stopping the preview\n`);
          takeSignals(undefined);
          void preview.close().then(resolve);
        });
      });
      io.err('eyeproof: the preview has stopped\n');
    });

  program.command('batch <plan>')
    .description('run a plan of frames × setups × viewers × gazes: on this machine (worker threads) by default, or through a Redis queue with --queue; resumable, writing results/ (results.jsonl, results.csv, summary.html) under the plan\'s root')
    .option('--queue <url>', 'enqueue the jobs in BullMQ on this Redis (redis://host:6379) for `eyeproof worker`s instead of running them here')
    .option('--status', 'with --queue: show the plan\'s progress and failures; when all is done, write the results index')
    .option('--threads <n>', 'worker threads on this machine (default: one per core, as memory allows)', (t) => positiveInt(t, 64))
    .option('-q, --quiet', 'no progress bar')
    .addHelpText('after', `
Examples:
  $ eyeproof batch release-plan.json                            # on this machine; Ctrl-C and rerun to resume
  $ eyeproof batch release-plan.json --queue redis://build-host:6379
  $ eyeproof worker --queue redis://build-host:6379 --concurrency 2   # on each machine (shared output folder)
  $ eyeproof batch release-plan.json --queue redis://build-host:6379 --status`)
    .action(async (planFile: string, opts: { queue?: string; status?: boolean; threads?: number; quiet?: boolean }) => {
      const plan = readPlan(planFile);
      const jobs = expandPlan(plan);
      if (opts.status && !opts.queue) throw new CommanderError(2, 'eyeproof.status', 'error: --status is for a plan run through --queue; a local run shows its progress as it goes');
      if (opts.queue && opts.status) {
        const s = await planStatus(plan, opts.queue);
        io.out(`${s.queue}: ${s.completed} completed, ${s.active} running, ${s.waiting} waiting, ${s.delayed} waiting to retry, ${s.failed} failed (of ${jobs.length} jobs in the plan)\n`);
        for (const f of s.failures) io.out(`  failed after ${f.attempts} attempts: ${f.folder}: ${f.error}\n`);
        if (s.waiting + s.active + s.delayed === 0) {
          await writeIndex(plan, jobs);
          io.out(`results index written to ${plan.root}/results/\n`);
        }
        return;
      }
      if (opts.queue) {
        const { added, skipped } = await enqueuePlan(plan, jobs, opts.queue);
        io.err(`eyeproof: ${added} jobs enqueued on ${opts.queue} (queue ${queueName(plan)}), ${skipped} already done. Start workers with \`eyeproof worker --queue ${opts.queue}\`; follow with --status.\n`);
        return;
      }
      const bar = progressBar(io, Boolean(opts.quiet));
      const failures: string[] = [];
      const start = performance.now();
      // Ctrl-C keeps every job already written (each is swapped in whole); a rerun resumes.
      takeSignals((signal) => {
        bar.end();
        io.err(`eyeproof: stopped by ${signal}; finished jobs are kept, jobs in progress are dropped. Run the same command again to resume.\n`);
        process.exit(signal === 'SIGINT' ? 130 : 143);
      });
      const r = await runPlanLocally(plan, jobs, {
        onProgress: (done, total, skipped) => bar.update(done, total, `jobs${skipped ? ` (${skipped} already done)` : ''}`),
        onFailure: (job, message) => failures.push(`${job.folder}: ${message.split('\n')[0]}`),
      }, opts.threads);
      takeSignals(undefined);
      bar.end();
      const minutes = (performance.now() - start) / 60_000;
      for (const f of failures) io.err(`eyeproof: failed: ${f}\n`);
      io.err(`eyeproof: ${r.done} jobs done${r.done ? ` (${(r.done / Math.max(minutes, 1e-9)).toFixed(1)} jobs per minute)` : ''}, ${r.skipped} already done, ${r.failed} failed; results in ${plan.root}/results/\n`);
      if (r.failed) throw new BatchFailed(r.failed);
    });

  program.command('worker')
    .description('take batch jobs from a Redis queue (BullMQ) and write their outputs into the plan\'s shared output folder, until stopped')
    .requiredOption('--queue <url>', 'the Redis the plans were enqueued on (redis://host:6379)')
    .option('--concurrency <n>', 'jobs at once in this process (default 1; a proof uses one core)', (t) => positiveInt(t, 64), 1)
    .option('--lock-seconds <s>', 'how long a job stays taken without a sign of life: a killed worker\'s job is taken again after it (default 60)', (t) => positiveInt(t, 3600), 60)
    .action(async (opts: { queue: string; concurrency: number; lockSeconds: number }) => {
      const worker = await startQueueWorker({ url: opts.queue, concurrency: opts.concurrency, lockMs: opts.lockSeconds * 1000, onEvent: (t) => io.err(`eyeproof worker: ${t}\n`) });
      io.err(`eyeproof worker: taking jobs from ${opts.queue} (concurrency ${opts.concurrency}); Ctrl-C to stop\n`);
      await new Promise<void>((resolve) => {
        takeSignals((signal) => {
          io.err(`eyeproof worker: ${signal}: finishing the jobs in progress\n`);
          takeSignals(undefined);
          void worker.stop().then(resolve);
        });
      });
    });

  program.command('presets')
    .description('list the built-in display and viewer presets')
    .option('--json', 'print JSON with each preset\'s values and basis')
    .addHelpText('after', '\nExample:\n  $ eyeproof presets')
    .action((opts: { json?: boolean }) => {
      if (opts.json) {
        io.out(`${JSON.stringify({ displays: displayPresets, viewers: viewerPresets }, null, 2)}\n`);
        return;
      }
      const width = Math.max(...[...displayPresets, ...viewerPresets].map((p) => p.name.length));
      const lines = ['Displays (--setup):', ...displayPresets.map((p) => `  ${p.name.padEnd(width)}  ${p.summary}`), '', 'Viewers (--viewer):', ...viewerPresets.map((p) => `  ${p.name.padEnd(width)}  ${p.summary}`), ''];
      io.out(lines.join('\n'));
    });

  program.command('schema')
    .description('print the JSON Schema of setup files (for editor completion)')
    .addHelpText('after', '\nExample:\n  $ eyeproof schema > setup.schema.json')
    .action(() => {
      io.out(`${JSON.stringify(setupJsonSchema(), null, 2)}\n`);
    });
  return program;
}

function report(io: CliIo, err: unknown): number {
  if (err instanceof CommanderError) {
    if (err.exitCode !== 0 && err.code.startsWith('eyeproof.')) io.err(`${err.message}\n`);
    return err.exitCode === 0 ? EXIT.ok : EXIT.usage;
  }
  if (err instanceof BatchFailed) return EXIT.input;
  if (err instanceof ConfigError) {
    io.err(`eyeproof: the setup is not valid.\n${err.message}\nFix these fields (see \`eyeproof schema\` and the README's setup reference) and run again. Nothing was written.\n`);
    return EXIT.setup;
  }
  if (err instanceof InputError) {
    io.err(`eyeproof: cannot use the input: ${err.message}.\n${err.fix} Nothing was written.\n`);
    return EXIT.input;
  }
  if (err instanceof OutputError) {
    io.err(`eyeproof: cannot write the output: ${err.message}.\n${err.fix}\n`);
    return EXIT.output;
  }
  io.err(`eyeproof: internal error — please report it with the command you ran.\n${(err as Error).stack ?? String(err)}\n`);
  return EXIT.internal;
}

/** Runs the command for `argv` (without node and the script) and returns the exit code; never throws. */
export async function runCli(argv: readonly string[], io: CliIo = processIo): Promise<number> {
  try {
    await buildProgram(io).parseAsync([...argv], { from: 'user' });
    return EXIT.ok;
  } catch (err) {
    return report(io, err);
  }
}
