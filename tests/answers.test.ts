/**
 * The answers a designer gets, end to end through proofFrame: verdicts that agree across frame
 * exports (pixel ratio, placement), gaze in every form, labels found in the frame, the audience and
 * the reach.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import sharp from 'sharp';
import { detectTextRuns, iou } from '../src/analysis/detect-text.js';
import type { Label, LabelVerdict } from '../src/analysis/labels.js';
import { validateSetup } from '../src/config/validate.js';
import { resolveGazeSpec } from '../src/geometry/gaze-spec.js';
import { projectionFor } from '../src/geometry/projection.js';
import { encodeRgba8Png, linearToRgba8 } from '../src/io/encode-png.js';
import { createLinearRgb, type LinearRgb } from '../src/image/plane.js';
import { prepareProof, lookAt, sizeSpec } from '../src/pipeline.js';
import { proofFrame } from '../src/proof.js';
import { screenSetup } from './helpers/synthetic.js';

const W = 640;
const H = 360;

/** A light frame with dark "text": rows of bars 2 px wide every 6 px, one block per label, scaled by k. */
function textFrame(k = 1): { frame: LinearRgb; labels: Label[] } {
  const frame = createLinearRgb(W * k, H * k);
  frame.planes.forEach((p) => p.fill(0.8));
  const blocks: [string, number, number, number, number][] = [['big', 40, 40, 200, 30], ['small', 40, 120, 120, 8], ['side', 420, 60, 150, 14], ['low', 360, 280, 200, 18]];
  const labels: Label[] = [];
  for (const [id, x, y, w, h] of blocks) {
    for (let yy = y * k; yy < (y + h) * k; yy++) for (let xx = x * k; xx < (x + w) * k; xx++) if (xx % (6 * k) < 2 * k) frame.planes.forEach((p) => { p[yy * W * k + xx] = 0.02; });
    labels.push({ id, text: 'X'.repeat(Math.round(w / (0.7 * h + 2))), boxPx: [x * k, y * k, w * k, h * k], letterHeightPx: h * k, role: id === 'side' ? 'glance' : 'look' });
  }
  return { frame, labels };
}

async function proof(frame: LinearRgb, labels: Label[], setupJson: Record<string, unknown>, gaze?: string): Promise<{ verdicts: LabelVerdict[]; notes: string[]; report: Record<string, unknown> }> {
  const png = await encodeRgba8Png(linearToRgba8(frame), frame.width, frame.height);
  const notes: string[] = [];
  const out = await proofFrame(png, 'f.png', validateSetup(setupJson, 'test'), 'test', {
    labels: { file: 'f.labels.json', text: JSON.stringify({ labels }) }, onNote: (n) => notes.push(n), ...(gaze ? { gaze } : {}),
  });
  return { verdicts: out.result.labels!, notes, report: out.report };
}

const base = screenSetup(W, H, 20, { viewer: { preset: 'age-55' } });

describe('frames as designers export them', () => {
  test('an @2x export with frame.pixelRatio 2 gets the verdicts of the 1× frame, and fixes in design px (common practice: @2x = 2 px per point)', async () => {
    const one = textFrame(1);
    const two = textFrame(2);
    const a = await proof(one.frame, one.labels, base);
    const b = await proof(two.frame, two.labels, { ...base, gaze: { xPx: 640, yPx: 360 }, frame: { pixelRatio: 2 } });
    expect(b.notes.join(' ')).not.toMatch(/scaled/);
    for (let i = 0; i < a.verdicts.length; i++) {
      expect(b.verdicts[i].verdict).toBe(a.verdicts[i].verdict);
      expect(b.verdicts[i].whenFixated.sizeMargin).toBeCloseTo(a.verdicts[i].whenFixated.sizeMargin, 1);
      if (a.verdicts[i].fix?.capHeight) expect(b.verdicts[i].fix!.capHeight!.designPx).toBeCloseTo(a.verdicts[i].fix!.capHeight!.px, -1);
    }
  });

  test('a 2× frame without a pixel ratio is announced with the scale used', async () => {
    const two = textFrame(2);
    const b = await proof(two.frame, two.labels, base);
    expect(b.notes.join(' ')).toMatch(/scaled to fill the 640×360 px display: 2\.000 frame px per display px.*frame\.pixelRatio to 2/);
    expect((b.report.frame as { framePxPerDisplayPx: number }).framePxPerDisplayPx).toBe(2);
  });

  test('a crop placed with frame.placementPx gets the verdicts of the same labels in the full frame', async () => {
    const { frame, labels } = textFrame(1);
    const crop = createLinearRgb(320, 180);
    crop.planes.forEach((p, c) => { for (let y = 0; y < 180; y++) p.set(frame.planes[c].subarray(y * W + 320, y * W + 640), y * 320); });
    const side = labels.find((l) => l.id === 'side')!;
    const inCrop: Label = { ...side, boxPx: [side.boxPx[0] - 320, side.boxPx[1], side.boxPx[2], side.boxPx[3]] };
    // The light is given: a crop cannot know what surrounds it on the display.
    const lit = { ...base, light: { adaptingLuminanceCdM2: 120 } };
    const full = await proof(frame, [side], { ...lit, gaze: { xPx: 300, yPx: 150 } });
    const part = await proof(crop, [inCrop], { ...lit, gaze: { xPx: -20, yPx: 150 }, frame: { placementPx: [320, 0, 320, 180] } });
    expect(part.verdicts[0].verdict).toBe(full.verdicts[0].verdict);
    expect(part.verdicts[0].fromGaze.eccentricityDeg).toBeCloseTo(full.verdicts[0].fromGaze.eccentricityDeg, 2);
    expect(part.verdicts[0].fromGaze.sizeMargin).toBeCloseTo(full.verdicts[0].fromGaze.sizeMargin, 2);
  });
});

describe('gaze as people give it', () => {
  const setup = validateSetup(base, 'test');
  const projection = projectionFor(setup.display, W, H);
  const { labels } = textFrame(1);
  const ctx = { frameSizePx: [W, H] as [number, number], projection, displayCentrePx: [W / 2 - 0.5, H / 2 - 0.5] as [number, number], labels };

  test('percent, label and degree forms agree with pixels (screen geometry, standard optics)', () => {
    expect(resolveGazeSpec('50%,50%', ctx)[0].gazePx).toEqual([320, 180]);
    expect(resolveGazeSpec('label:big', ctx)[0].gazePx).toEqual([140, 55]);
    const [centre] = resolveGazeSpec('0deg,0deg', ctx);
    expect(centre.gazePx[0]).toBeCloseTo(319.5, 6);
    // 10° right on a flat screen lies tan(10°)·d to the right of the centre.
    const [right] = resolveGazeSpec('10°,0°', ctx);
    const pxPerTan = 1 / projection.kxPerPx;
    expect(right.gazePx[0] - centre.gazePx[0]).toBeCloseTo(Math.tan((10 * Math.PI) / 180) * pxPerTan, 3);
    expect(resolveGazeSpec('labels', ctx).map((g) => g.given)).toEqual(labels.map((l) => `label:${l.id}`));
  });

  test('a gaze above the frame (the road over a cluster) is allowed and reported; nonsense is refused with the forms', () => {
    const [road] = resolveGazeSpec('320,-300', ctx);
    expect(road.outsideFrame).toBe(true);
    expect(() => resolveGazeSpec('somewhere', ctx)).toThrow(/x%,y%/);
    expect(() => resolveGazeSpec('label:nope', ctx)).toThrow(/big, small, side, low/);
    expect(() => resolveGazeSpec('320,-3000', ctx)).toThrow(/two frame sizes/);
  });

  test('a list of fixations gives the verdicts at each, the same as separate runs', async () => {
    const { frame } = textFrame(1);
    const listed = await proof(frame, labels, base, '50%,50%; label:side; 320,-300');
    const fixations = listed.report.fixations as { given: string; outsideFrame: boolean; labels: { id: string; verdict: string }[] }[];
    expect(fixations.map((f) => f.given)).toEqual(['50%,50%', 'label:side', '320,-300']);
    expect(fixations[2].outsideFrame).toBe(true);
    expect(listed.notes.join(' ')).toMatch(/outside the frame/);
    const alone = await proof(frame, labels, base, 'label:side');
    expect(fixations[1].labels.map((l) => l.verdict)).toEqual(alone.verdicts.map((v) => v.verdict));
  });
});

describe('the audience and the reach', () => {
  const { frame, labels } = textFrame(1);
  const prepared = (age: number, height = 14, text?: string): ReturnType<typeof lookAt> => {
    const setup = validateSetup({ ...base, viewer: { ageYears: age } }, 'test');
    const p = prepareProof(frame, setup, 'test');
    return lookAt(p, { labels: labels.map((l) => (l.id === 'side' ? { ...l, letterHeightPx: height, ...(text ? { text } : {}) } : l)) });
  };

  test('audience share rises with letter height (Hofstetter 1950 spread; Watson & Yellott 2012 pupils)', () => {
    const shares = [6, 10, 14, 20, 30].map((h) => prepared(30, h).labels!.find((l) => l.id === 'side')!);
    const fixed = shares.map((v) => v.audience!);
    for (let i = 1; i < fixed.length; i++) {
      expect(fixed[i].uncorrected).toBeGreaterThanOrEqual(fixed[i - 1].uncorrected);
      expect(fixed[i].corrected).toBeGreaterThanOrEqual(fixed[i - 1].corrected);
    }
  });

  test('the reach outline grows with letter size and shrinks with age (models only, no percept per gaze)', () => {
    const area = (v: LabelVerdict): number => v.reach!.radiusDeg.reduce((a, r) => a + r * r, 0);
    // Two letters far apart: the size, which depends on the eye, limits the reach before crowding does.
    const side = (age: number, h: number): LabelVerdict => prepared(age, h, 'XX').labels!.find((l) => l.id === 'side')!;
    expect(area(side(30, 24))).toBeGreaterThan(area(side(30, 14)));
    expect(area(side(75, 14))).toBeLessThan(area(side(25, 14)));
    expect(side(30, 24).reach!.outlinePx!.length).toBe(36);
  });

  test('sizes: the 90 % size is at least the 50 % one, corrected needs no more than uncorrected for the young (Hofstetter 1950)', () => {
    const setup = validateSetup({ ...base }, 'test');
    const s50 = sizeSpec(setup, 50).rows;
    const s90 = sizeSpec(setup, 90).rows;
    for (let i = 0; i < s50.length; i++) {
      expect(s90[i].audience!.uncorrected.px).toBeGreaterThanOrEqual(s50[i].audience!.uncorrected.px);
      expect(s90[i].audience!.corrected.px).toBeGreaterThanOrEqual(s50[i].audience!.corrected.px);
      expect(s90[i].capHeight.px).toBeGreaterThanOrEqual(i ? s90[i - 1].capHeight.px : 0);
    }
  });
});

describe('labels found in the frame', () => {
  test.each(['ferry-console', 'picker-headset'])('the %s sample scene\'s drawn labels are found: boxes IoU ≥ 0.4, capital heights within 10 % (our scenes, drawn with known boxes)', async (name) => {
    const { data, info } = await sharp(`sample-scenes/${name}.png`).ensureAlpha().raw().toBuffer({ resolveWithObject: true });
    const runs = detectTextRuns(data, info.width, info.height);
    const truth = JSON.parse(readFileSync(`sample-scenes/${name}.labels.json`, 'utf8')).labels as Label[];
    let found = 0;
    for (const l of truth) {
      const m = runs.find((r) => iou(l.boxPx, r.boxPx) >= 0.4);
      if (!m) continue;
      found++;
      expect(Math.abs(m.letterHeightPx / l.letterHeightPx - 1), l.id).toBeLessThanOrEqual(0.1);
    }
    expect(found / truth.length).toBeGreaterThanOrEqual(0.95);
    // Few runs that are not labels.
    expect(runs.length).toBeLessThanOrEqual(truth.length + 2);
  });
});
