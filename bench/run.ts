/**
 * Benchmarks as ratios to baselines measured in the same run, so numbers compare across machines:
 *   blur — sharp's Gaussian blur (σ 5) of an 8-bit RGB frame of the same size (sharp's concurrency
 *          is printed);
 *   copy — a plain copy of the Float32 RGB frame of that size.
 * For each frame size: every stage of a proof (prepare and look), the proof's computation (decoded
 * frame to percept, maps and verdicts, no encoding), the whole proof as the command runs it
 * (decoding, every output, less process start-up), a gaze change with the frame's work cached, and
 * peak memory above the process's start (each size runs in a child process of its own).
 * Run `npm run bench`; BENCH_RUNS (default 5) runs per case after a warm-up, median with min–max;
 * BENCH_SIZES (e.g. "1920x1080") limits the sizes.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import sharp from 'sharp';
import { validateSetup } from '../src/config/validate.js';
import { srgbToLinear } from '../src/colour/srgb.js';
import { createLinearRgb, type LinearRgb } from '../src/image/plane.js';
import { lookAt, prepareProof } from '../src/pipeline.js';
import { proofFrame } from '../src/proof.js';

const runs = Number(process.env.BENCH_RUNS ?? 5);
const SIZES: [number, number][] = (process.env.BENCH_SIZES ?? '1920x1080,2160x2160,3840x2160').split(',').map((s) => s.split('x').map(Number) as [number, number]);

interface Timing {
  median: number;
  min: number;
  max: number;
}

async function time(fn: () => unknown | Promise<unknown>): Promise<Timing> {
  await fn();
  const samples: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    await fn();
    samples.push(performance.now() - t0);
  }
  samples.sort((a, b) => a - b);
  return { median: samples[Math.floor(samples.length / 2)], min: samples[0], max: samples[samples.length - 1] };
}

/** The bundled ferry console scaled to the size: a realistic interface frame (8-bit PNG and linear). */
async function frameOfSize(width: number, height: number): Promise<{ png: Buffer; linear: LinearRgb }> {
  const source = join(import.meta.dirname, '..', 'sample-scenes', 'ferry-console.png');
  const png = await sharp(readFileSync(source)).resize(width, height, { fit: 'fill' }).removeAlpha().png().toBuffer();
  const { data } = await sharp(png).raw().toBuffer({ resolveWithObject: true });
  const linear = createLinearRgb(width, height);
  const lut = Float32Array.from({ length: 256 }, (_, v) => srgbToLinear(v / 255));
  for (let i = 0; i < width * height; i++) for (let c = 0; c < 3; c++) linear.planes[c][i] = lut[data[3 * i + c]];
  return { png, linear };
}

/** Setup: the default viewer before a screen like the default one (597.7 mm wide at 70 cm) with the frame's size and aspect. */
function setupFor(width: number, height: number): ReturnType<typeof validateSetup> {
  return validateSetup({
    display: { kind: 'screen', widthMm: 597.7, heightMm: (597.7 * height) / width, resolutionPx: [width, height], viewingDistanceMm: 700, peakLuminanceCdM2: 250, blackLuminanceCdM2: 0.25 },
  }, 'bench');
}

interface SizeResult {
  size: string;
  sharpConcurrency: number;
  blur: Timing;
  copy: Timing;
  rows: [string, Timing][];
  peakMemoryMb: number;
  frameMb: number;
}

async function benchSize(width: number, height: number): Promise<SizeResult> {
  const { png, linear } = await frameOfSize(width, height);
  const setup = setupFor(width, height);
  const rgb8 = await sharp(png).raw().toBuffer();
  const blur = await time(() => sharp(rgb8, { raw: { width, height, channels: 3 } }).blur(5).raw().toBuffer());
  const copyTarget = linear.planes.map((p) => new Float32Array(p.length));
  const copy = await time(() => linear.planes.forEach((p, c) => copyTarget[c].set(p)));

  // Stages of one proof, from the pipeline's own stage marks (median over the runs).
  const stageSamples = new Map<string, number[]>();
  const record = (stages: [string, number][]): void => stages.forEach(([name, ms]) => stageSamples.set(name, [...(stageSamples.get(name) ?? []), ms]));
  const staged = (): void => {
    const marks: [string, number][] = [];
    let last = performance.now();
    let current = 'start';
    const onStage = (s: string): void => {
      const now = performance.now();
      marks.push([current, now - last]);
      [current, last] = [s, now];
    };
    const prepared = prepareProof(linear, setup, 'bench', { onStage });
    onStage('look');
    lookAt(prepared, { onStage });
    onStage('end');
    record(marks.filter(([name]) => name !== 'start'));
  };
  staged();
  stageSamples.clear();
  for (let i = 0; i < runs; i++) staged();
  const rows: [string, Timing][] = [...stageSamples].map(([name, samples]) => {
    const s = [...samples].sort((a, b) => a - b);
    return [`  stage: ${name}`, { median: s[Math.floor(s.length / 2)], min: s[0], max: s[s.length - 1] }];
  });

  rows.push(['proof computation (frame to percept, maps, verdicts)', await time(() => lookAt(prepareProof(linear, setup, 'bench')))]);
  rows.push(['whole proof as the command runs it (decode, every output)', await time(() => proofFrame(png, 'bench.png', setup, 'bench'))]);
  const prepared = prepareProof(linear, setup, 'bench');
  let k = 0;
  let last = lookAt(prepared);
  rows.push(['gaze change, frame work cached (arrays of the last gaze reused, as a live preview does)', await time(() => {
    last = lookAt(prepared, { reuse: last, gazePx: [Math.round(width * (0.3 + 0.1 * (k++ % 4))), Math.round(height / 2)] });
  })]);
  return {
    size: `${width}×${height}`, sharpConcurrency: sharp.concurrency(), blur, copy, rows,
    peakMemoryMb: memoryOfOneProof(width, height), frameMb: (3 * 4 * width * height) / 2 ** 20,
  };
}

/**
 * Peak memory (MB) of one proof's computation in a fresh process, above the process once the frame
 * is decoded: the high-water mark of the resident set, garbage not yet collected included.
 */
function memoryOfOneProof(width: number, height: number): number {
  return Number(execFileSync(process.execPath, ['--import', 'tsx', import.meta.filename, '--memory', `${width}x${height}`], { encoding: 'utf8' }));
}

const fmt = (t: Timing, base: number): string => `${t.median.toFixed(0)} (${t.min.toFixed(0)}–${t.max.toFixed(0)}) | ${(t.median / base).toFixed(1)}`;

if (process.argv[2] === '--memory') {
  const [w, h] = process.argv[3].split('x').map(Number);
  const { linear } = await frameOfSize(w, h);
  const setup = setupFor(w, h);
  // Warm the model's tables on a small frame first: they are the process's, not the frame's.
  lookAt(prepareProof((await frameOfSize(64, Math.round((64 * h) / w))).linear, setupFor(64, Math.round((64 * h) / w)), 'bench'));
  const atStart = process.memoryUsage().rss;
  lookAt(prepareProof(linear, setup, 'bench'));
  process.stdout.write(String((process.resourceUsage().maxRSS * 1024 - atStart) / 2 ** 20));
} else if (process.argv[2] === '--size') {
  const [w, h] = process.argv[3].split('x').map(Number);
  process.stdout.write(JSON.stringify(await benchSize(w, h)));
} else {
  const results: SizeResult[] = SIZES.map(([w, h]) => JSON.parse(execFileSync(process.execPath, ['--import', 'tsx', import.meta.filename, '--size', `${w}x${h}`], { encoding: 'utf8', maxBuffer: 1 << 24 })));
  const first = results[0];
  const firstProof = first.rows.find(([n]) => n.startsWith('proof computation'))![1].median;
  const lines: string[] = [];
  for (const r of results) {
    lines.push(`### ${r.size} (median of ${runs} after a warm-up; sharp concurrency ${r.sharpConcurrency})`, '');
    lines.push(`baselines: sharp blur σ 5 of 8-bit RGB = ${r.blur.median.toFixed(1)} ms; Float32 RGB frame copy = ${r.copy.median.toFixed(1)} ms`, '');
    lines.push('| case | ms (min–max) | × blur | × copy |', '|---|---:|---:|---:|');
    for (const [name, t] of r.rows) lines.push(`| ${name} | ${fmt(t, r.blur.median)} | ${(t.median / r.copy.median).toFixed(0)} |`);
    const proof = r.rows.find(([n]) => n.startsWith('proof computation'))![1].median;
    lines.push(`| peak memory of one proof above the decoded frame | ${r.peakMemoryMb.toFixed(0)} MB | ${(r.peakMemoryMb / r.frameMb).toFixed(1)} × the Float32 RGB frame | |`);
    if (r !== first) lines.push('', `proof computation = ${(proof / firstProof).toFixed(2)} × the ${first.size} one (pixels ${((Number(r.size.split('×')[0]) * Number(r.size.split('×')[1])) / (Number(first.size.split('×')[0]) * Number(first.size.split('×')[1]))).toFixed(2)}×)`);
    lines.push('');
  }
  process.stdout.write(`${lines.join('\n')}\n`);
}
