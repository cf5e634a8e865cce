/**
 * Sweeps: several frames and several viewers (or distances) in one run. Each frame and viewer is one
 * proof (prepared once; every gaze of a gaze list reuses it) written into its own folder, and the
 * sweep adds a contact sheet (the percepts in a grid with one-line captions), a side-by-side of the
 * first two viewers with the differences explained, and one page for the whole sweep.
 */
import sharp from 'sharp';
import type { LabelVerdict } from './analysis/labels.js';
import type { Setup } from './config/setup.js';
import type { OutputFile } from './io/write-outputs.js';
import { linearToRgba8 } from './io/encode-png.js';
import { proofFrame, type ProofInputs, type ProofOutputs } from './proof.js';
import { canvasRgba, font, newCanvas } from './render/canvas.js';
import { CAUTION_SHORT, CAUTIONS } from './report/cautions.js';
import { describeVerdicts } from './report/build-report.js';
import { EYEPROOF_VERSION } from './version.js';

export interface SweepFrame {
  file: string;
  bytes: Uint8Array;
  /** Folder name of the frame in the sweep. */
  name: string;
  inputs: Omit<ProofInputs, 'onStage' | 'onNote'>;
}

export interface SweepVariant {
  /** Folder name and caption of the viewer (and distance). */
  name: string;
  setup: Setup;
  source: string;
}

export const SWEEP_FILES = ['contact-sheet.png', 'compare-viewers.png', 'sweep.html', 'sweep.json'] as const;

interface Done {
  frame: SweepFrame;
  variant: SweepVariant;
  numbers: ProofOutputs['result']['numbers'];
  labels?: LabelVerdict[];
  /** The percept, small: THUMB_WIDTH wide for the sheet, COMPARE_WIDTH for the two-viewer picture. */
  thumb: Thumb;
  /** With a gaze list: each fixation's percept for the sheet, and what it was. */
  fixationThumbs?: { given: string; thumb: Thumb; labels?: LabelVerdict[] }[];
  wide?: Thumb;
}

interface Thumb {
  rgba: Uint8Array;
  width: number;
  height: number;
}

const THUMB_WIDTH = 480;
const COMPARE_WIDTH = 900;

function counts(labels: readonly LabelVerdict[] | undefined): string {
  return labels ? describeVerdicts(labels, ' · ') : 'no labels';
}

/** A small picture from JPEG bytes (a fixation's percept). */
async function thumbnailOfJpeg(jpeg: Uint8Array, width: number): Promise<Thumb> {
  const { data, info } = await sharp(jpeg).resize({ width, kernel: 'lanczos3' }).ensureAlpha().raw().toBuffer({ resolveWithObject: true });
  return { rgba: new Uint8Array(data), width: info.width, height: info.height };
}

async function thumbnail(out: ProofOutputs, width: number): Promise<Thumb> {
  const p = out.result.percept;
  const rgba = linearToRgba8(p);
  const h = Math.round((p.height * width) / p.width);
  const data = await sharp(Buffer.from(rgba.buffer, rgba.byteOffset, rgba.byteLength), { raw: { width: p.width, height: p.height, channels: 4 } }).resize({ width, height: h, kernel: 'lanczos3' }).raw().toBuffer();
  return { rgba: new Uint8Array(data), width, height: h };
}

function put(g: ReturnType<typeof newCanvas>['g'], img: { rgba: Uint8Array; width: number; height: number }, x: number, y: number): void {
  const data = g.createImageData(img.width, img.height);
  data.data.set(img.rgba);
  g.putImageData(data, x, y);
}

/** The percepts in a grid (a row per frame and fixation, viewers in columns), each with a one-line caption. */
async function contactSheet(done: Done[], frames: SweepFrame[], variants: SweepVariant[]): Promise<Uint8Array> {
  const pad = 16;
  const caption = 44;
  // One cell per proof and fixation; rows: frames, each as many times as its gaze list is long.
  const cells = done.flatMap((d) => (d.fixationThumbs?.length ? d.fixationThumbs.map((f, k) => ({ d, k, given: f.given, thumb: f.thumb, labels: f.labels })) : [{ d, k: 0, given: `${d.numbers.gazePx.join(',')} px`, thumb: d.thumb, labels: d.labels }]));
  const rowsPerFrame = new Map(frames.map((f) => [f, Math.max(1, ...done.filter((d) => d.frame === f).map((d) => d.fixationThumbs?.length ?? 1))]));
  const rowStart = new Map<SweepFrame, number>();
  let rowCount = 0;
  for (const f of frames) {
    rowStart.set(f, rowCount);
    rowCount += rowsPerFrame.get(f)!;
  }
  const thumbs = cells.map((c) => c.thumb);
  const cellH = Math.max(...thumbs.map((t) => t.height)) + caption;
  const width = pad + variants.length * (THUMB_WIDTH + pad);
  const header = 56;
  const height = header + rowCount * (cellH + pad) + 28;
  const { canvas, g } = newCanvas(width, height);
  g.fillStyle = '#15171c';
  g.fillRect(0, 0, width, height);
  g.fillStyle = '#f0f0f0';
  g.font = font(18, true);
  g.fillText(`Contact sheet: ${frames.length} frame${frames.length > 1 ? 's' : ''} × ${variants.length} viewer${variants.length > 1 ? 's' : ''} — what each viewer resolves`, pad, 28);
  g.font = font(13);
  g.fillStyle = '#9aa3b0';
  g.fillText('Rows: frames (and each gaze of a gaze list). Columns: viewers. Captions: frame · viewer · gaze, then the label verdicts.', pad, 46);
  cells.forEach((c, i) => {
    const row = rowStart.get(c.d.frame)! + c.k;
    const col = variants.indexOf(c.d.variant);
    const x = pad + col * (THUMB_WIDTH + pad);
    const y = header + row * (cellH + pad);
    put(g, thumbs[i], x, y);
    g.fillStyle = '#f0f0f0';
    g.font = font(13, true);
    g.fillText(`${c.d.frame.name} · ${c.d.variant.name} · gaze ${c.given}`, x, y + thumbs[i].height + 17);
    g.font = font(12);
    g.fillStyle = '#cfd4dc';
    g.fillText(counts(c.labels), x, y + thumbs[i].height + 34);
  });
  g.font = font(11);
  g.fillStyle = '#9aa3b0';
  g.fillText(`eyeproof · ${CAUTION_SHORT}`, pad, height - 10);
  const rgba = canvasRgba(canvas);
  return new Uint8Array(await sharp(Buffer.from(rgba.buffer, rgba.byteOffset, rgba.byteLength), { raw: { width, height, channels: 4 } }).removeAlpha().png().toBuffer());
}

/** What differs between two viewers of the same frame, in sentences. */
export function differences(a: Done, b: Done): string[] {
  const ea = a.numbers.eye;
  const eb = b.numbers.eye;
  const lines = [
    `defocus ${ea.defocusD.toFixed(2)} → ${eb.defocusD.toFixed(2)} D (accommodation ${ea.accommodationAmplitudeD.toFixed(1)} → ${eb.accommodationAmplitudeD.toFixed(1)} D)`,
    `pupil ${ea.pupilDiameterMm.toFixed(1)} → ${eb.pupilDiameterMm.toFixed(1)} mm`,
    `smallest letter at the gaze ${ea.smallestLetterArcminAtGaze.toFixed(1)}′ → ${eb.smallestLetterArcminAtGaze.toFixed(1)}′`,
  ];
  const la = a.labels ?? [];
  const lb = b.labels ?? [];
  const changed = la.flatMap((v) => {
    const w = lb.find((x) => x.id === v.id);
    return w && w.verdict !== v.verdict ? [`${v.id} ${v.verdict} → ${w.verdict}`] : [];
  });
  lines.push(changed.length ? `${changed.length} label${changed.length > 1 ? 's' : ''} change verdict: ${changed.join('; ')}` : 'no label changes verdict');
  return lines;
}

async function viewerComparison(a: Done, b: Done): Promise<Uint8Array> {
  const half = COMPARE_WIDTH;
  const [ta, tb] = [a.wide!, b.wide!];
  const pad = 16;
  const lines = differences(a, b);
  const header = 60;
  const textH = 22 * (lines.length + 1) + 40;
  const width = pad * 3 + 2 * half;
  const height = header + Math.max(ta.height, tb.height) + textH;
  const { canvas, g } = newCanvas(width, height);
  g.fillStyle = '#15171c';
  g.fillRect(0, 0, width, height);
  g.fillStyle = '#f0f0f0';
  g.font = font(18, true);
  g.fillText(`${a.frame.name}: ${a.variant.name} (left) and ${b.variant.name} (right)`, pad, 30);
  g.font = font(13);
  g.fillStyle = '#9aa3b0';
  g.fillText('What each viewer resolves with the gaze held at the same place.', pad, 50);
  put(g, ta, pad, header);
  put(g, tb, pad * 2 + half, header);
  let y = header + Math.max(ta.height, tb.height) + 28;
  g.fillStyle = '#f0f0f0';
  g.font = font(15, true);
  g.fillText('What differs, left → right', pad, y);
  g.font = font(14);
  g.fillStyle = '#cfd4dc';
  for (const line of lines) {
    y += 22;
    g.fillText(`• ${line.length > 230 ? `${line.slice(0, 229)}…` : line}`, pad, y);
  }
  const rgba = canvasRgba(canvas);
  return new Uint8Array(await sharp(Buffer.from(rgba.buffer, rgba.byteOffset, rgba.byteLength), { raw: { width, height, channels: 4 } }).removeAlpha().png().toBuffer());
}

const esc = (s: string): string => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

function sweepPage(done: Done[], sheet: Uint8Array, comparison: Uint8Array | undefined, diff: string[]): string {
  const csp = "default-src 'none'; img-src data:; style-src 'unsafe-inline'; base-uri 'none'; form-action 'none'";
  const img = (png: Uint8Array, alt: string): string => `<img src="data:image/png;base64,${Buffer.from(png).toString('base64')}" alt="${esc(alt)}">`;
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta http-equiv="Content-Security-Policy" content="${csp}"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>eyeproof sweep</title>
<style>
body { margin: 0 auto; max-width: 1280px; padding: 20px; font: 15px/1.45 system-ui, sans-serif; color: #1d2126; background: #f7f6f2; }
img { max-width: 100%; height: auto; display: block; border: 1px solid #d9dbd6; }
table { border-collapse: collapse; width: 100%; font-size: 14px; } th, td { text-align: left; padding: 5px 8px; border-bottom: 1px solid #d9dbd6; }
.caution { background: #fff4d6; border-left: 4px solid #e6a100; padding: 8px 12px; }
</style></head><body>
<h1>eyeproof sweep: ${done.length} proofs</h1>
<p class="caution">${CAUTIONS.map(esc).join(' ')}</p>
<h2>Contact sheet</h2>${img(sheet, 'contact sheet of the percepts')}
${comparison ? `<h2>Two viewers</h2>${img(comparison, 'two viewers side by side')}<ul>${diff.map((d) => `<li>${esc(d)}</li>`).join('')}</ul>` : ''}
<h2>Proofs</h2>
<table><thead><tr><th>frame</th><th>viewer</th><th>labels</th><th>review</th></tr></thead><tbody>
${done.map((d) => `<tr><td>${esc(d.frame.name)}</td><td>${esc(d.variant.name)}</td><td>${esc(counts(d.labels))}</td><td><a href="${esc(`${d.frame.name}/${d.variant.name}/review.html`)}">review.html</a></td></tr>`).join('\n')}
</tbody></table>
<p>eyeproof ${EYEPROOF_VERSION}</p>
</body></html>
`;
}

/** Runs every frame with every viewer; returns every output as nested names under the sweep's folder. */
export async function runSweep(frames: SweepFrame[], variants: SweepVariant[], onNote: (n: string) => void, onProgress: (done: number, total: number, what: string) => void): Promise<{ files: OutputFile[]; done: Done[] }> {
  const files: OutputFile[] = [];
  const done: Done[] = [];
  const total = frames.length * variants.length;
  for (const frame of frames) {
    for (const variant of variants) {
      onProgress(done.length, total, `${frame.name} · ${variant.name}`);
      const out = await proofFrame(frame.bytes, frame.file, variant.setup, variant.source, { ...frame.inputs, onNote: (n) => onNote(`${frame.name} · ${variant.name}: ${n}`) });
      for (const f of out.files) files.push({ name: `${frame.name}/${variant.name}/${f.name}`, bytes: f.bytes });
      // Only small pictures and the figures are kept: the proof's full-size arrays go.
      const first = frame === frames[0] && variants.indexOf(variant) < 2 && variants.length > 1;
      const fixationThumbs = out.fixationPictures
        ? await Promise.all(out.fixationPictures.map(async (p, k) => ({ given: p.given, thumb: await thumbnailOfJpeg(p.jpeg, THUMB_WIDTH), ...(out.fixations?.[k]?.labels ? { labels: out.fixations[k].labels } : {}) })))
        : undefined;
      done.push({
        frame, variant, numbers: out.result.numbers, ...(out.result.labels ? { labels: out.result.labels } : {}), thumb: await thumbnail(out, THUMB_WIDTH),
        ...(first ? { wide: await thumbnail(out, COMPARE_WIDTH) } : {}), ...(fixationThumbs ? { fixationThumbs } : {}),
      });
    }
  }
  onProgress(total, total, 'contact sheet');
  const sheet = await contactSheet(done, frames, variants);
  const pair = variants.length > 1 ? [done[0], done[1]] as const : undefined;
  const comparison = pair ? await viewerComparison(pair[0], pair[1]) : undefined;
  const diff = pair ? differences(pair[0], pair[1]) : [];
  files.push({ name: 'contact-sheet.png', bytes: sheet });
  if (comparison) files.push({ name: 'compare-viewers.png', bytes: comparison });
  files.push({ name: 'sweep.html', bytes: sweepPage(done, sheet, comparison, diff) });
  files.push({
    name: 'sweep.json',
    bytes: `${JSON.stringify({
      eyeproofVersion: EYEPROOF_VERSION,
      proofs: done.map((d) => ({ frame: d.frame.file, folder: `${d.frame.name}/${d.variant.name}`, viewer: d.variant.name, labels: (d.labels ?? []).map((l) => ({ id: l.id, role: l.role, verdict: l.verdict, passes: l.passes })) })),
      ...(pair ? { viewerDifferences: diff } : {}),
    }, null, 2)}\n`,
  });
  return { files, done };
}
