import { copyFileSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import sharp from 'sharp';
import { beforeAll, describe, expect, test } from 'vitest';
import { runEyeproof } from './helpers/run-cli.js';
import { neuralAcuityFactor } from '../src/retina/neural-ageing.js';

const root = join(import.meta.dirname, '..');

const run = runEyeproof;

let dir: string;
let frame: string;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'eyeproof-cli-'));
  frame = join(dir, 'frame.png');
  // 640×360: the 16:9 aspect of the desktop-27in preset, shown full-screen.
  await sharp({ create: { width: 640, height: 360, channels: 3, background: { r: 40, g: 60, b: 90 } } })
    .composite([{ input: Buffer.from('<svg width="200" height="40"><rect width="200" height="40" fill="#fff"/></svg>'), left: 300, top: 160 }])
    .png().toFile(frame);
});

describe('eyeproof command', () => {
  test('proof writes every output and exits 0, saying the frame is scaled to the display', async () => {
    const out = join(dir, 'out');
    const r = await run(['proof', frame, '--setup', 'desktop-27in', '--viewer', 'age-55', '--gaze', '320,180', '--out', out]);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/optics/);
    expect(readdirSync(out).sort()).toEqual(['audience.png', 'compare-slide.png', 'compare.png', 'detail-map.png', 'percept.png', 'psf.png', 'reach.png', 'report.json', 'review.html']);
    expect(r.stderr).toMatch(/note: the 640×360 px frame is scaled to fill the 2560×1440 px display: 0\.250 frame px per display px/);
    const report = JSON.parse(readFileSync(join(out, 'report.json'), 'utf8'));
    expect(report.cautions.join(' ')).toMatch(/not a medical device/);
    expect(report.gaze).toEqual({ xPx: 320, yPx: 180 });
    // The 640-px frame fills the 2560-px panel: 4 panel pixels per frame pixel (derived).
    expect(report.display.pixelsPerDegreeAtGaze / report.display.framePixelsPerDegreeAtGaze).toBeCloseTo(4, 4);
    const percept = await sharp(join(out, 'percept.png')).metadata();
    expect([percept.width, percept.height]).toEqual([640, 360]);
  });

  test('proof --json prints the report and nothing else on stdout', async () => {
    const r = await run(['proof', frame, '--json', '--out', join(dir, 'json-out')]);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(JSON.parse(r.stdout).models.map((m: { stage: string }) => m.stage)).toContain('retina');
  });

  test('numbers --json for headset-wide and age-25 carries the report keys with the derived values', async () => {
    const r = await run(['numbers', '--setup', 'headset-wide', '--viewer', 'age-25', '--json']);
    expect(r.code).toBe(0);
    const n = JSON.parse(r.stdout);
    // Rectilinear buffer: (800 / tan 50°)·π/180 px/° at the centre (derived).
    expect(n.display.pixelsPerDegreeAtGaze).toBeCloseTo(((800 / Math.tan((50 * Math.PI) / 180)) * Math.PI) / 180, 3);
    expect(n.display.fieldOfViewDeg).toEqual({ horizontal: 100, vertical: 100 });
    expect(n.display.focalDistanceM).toBe(1.3);
    // Hofstetter (1950) mean: 18.5 − 0.3·25 = 11 D; 1.3 m asks for 1/1.3 D.
    expect(n.eye.accommodationAmplitudeD).toBe(11);
    expect(n.eye.accommodationD).toBeCloseTo(1 / 1.3, 4);
    expect(n.eye.defocusD).toBe(0);
    expect(typeof n.eye.pupilDiameterMm).toBe('number');
    expect(n.eye.blurCircleArcmin).toBe(0);
    expect(n.acuity.map((a: { eccentricityDeg: number }) => a.eccentricityDeg)).toEqual([0, 2, 5, 10, 20, 30, 40]);
    for (const key of ['eccentricityDeg', 'meridian', 'cutoffCpd', 'smallestLetterArcmin', 'smallestLetterPx']) expect(n.acuity[3]).toHaveProperty(key);
    // Watson (2014): 65.37 cpd at the fovea, times the neural factor fitted for age 25 (neural-ageing.ts).
    expect(n.acuity[0].cutoffCpd).toBeCloseTo(65.37 * neuralAcuityFactor(25), 2);
    expect(n.models.length).toBeGreaterThan(3);
  });

  test('numbers prints a table by default', async () => {
    const r = await run(['numbers', '--setup', 'vehicle-cluster', '--viewer', 'age-70']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/pixels per degree at gaze/);
    expect(r.stdout).toMatch(/residual defocus +1\.25 D/);
  });

  test('presets lists every display and viewer', async () => {
    const r = await run(['presets']);
    for (const name of ['desktop-27in', 'laptop-14in', 'phone-6in', 'vehicle-cluster', 'headset-wide', 'headset-narrow', 'age-25', 'age-45', 'age-55', 'age-70', 'myope-2d']) expect(r.stdout).toContain(name);
  });

  test('--help shows examples', async () => {
    const r = await run(['proof', '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/Examples:/);
  });

  test('an invalid setup exits 3, names every field with its allowed range, and writes nothing', async () => {
    const setup = join(dir, 'bad.json');
    writeFileSync(setup, JSON.stringify({ display: { preset: 'desktop-27in', viewingDistanceMm: 1 }, viewer: { ageYears: 500 } }));
    const out = join(dir, 'bad-out');
    const r = await run(['proof', frame, '--setup', setup, '--out', out]);
    expect(r.code).toBe(3);
    expect(r.stderr).toMatch(/display\.viewingDistanceMm but received 1/);
    expect(r.stderr).toMatch(/viewer\.ageYears but received 500/);
    expect(r.stderr).toMatch(/from 100 to 50000 mm/);
    expect(() => readdirSync(out)).toThrow();
  });

  test('a setup that is not JSON exits 3 with the line and column of the error; comments and trailing commas are allowed, as editors allow them', async () => {
    const setup = join(dir, 'broken.json');
    writeFileSync(setup, '{\n  "display": {\n    preset: "desktop-27in"\n  }\n}');
    const r = await run(['numbers', '--setup', setup]);
    expect(r.code).toBe(3);
    expect(r.stderr).toMatch(/line 3, column 5/);
    expect(r.stderr).toMatch(/a key in double quotes/);
    const lenient = join(dir, 'lenient.json');
    writeFileSync(lenient, '\ufeff{\n  // the office screen\n  "display": {\n    "preset": "desktop-27in",\n  },\n}');
    expect((await run(['numbers', '--setup', lenient])).code).toBe(0);
  });

  test('a missing frame and a non-image frame exit 4', async () => {
    expect((await run(['proof', join(dir, 'nope.png'), '--out', join(dir, 'o1')])).code).toBe(4);
    const text = join(dir, 'notes.png');
    writeFileSync(text, 'not an image');
    const r = await run(['proof', text, '--out', join(dir, 'o2')]);
    expect(r.code).toBe(4);
    expect(r.stderr).toMatch(/notes\.png/);
  });

  test('a frame whose aspect ratio differs from the display exits 4 and says how to fix it', async () => {
    const square = join(dir, 'square.png');
    await sharp({ create: { width: 100, height: 100, channels: 3, background: '#000' } }).png().toFile(square);
    const r = await run(['proof', square, '--setup', 'desktop-27in', '--out', join(dir, 'o3')]);
    expect(r.code).toBe(4);
    expect(r.stderr).toMatch(/resolutionPx/);
  });

  test('an output path that is a file exits 5; the input is never overwritten', async () => {
    const r = await run(['proof', frame, '--out', frame]);
    expect(r.code).toBe(5);
    // The output folder is replaced as a whole, so a folder holding other files (the frame's own) is refused.
    const before = readFileSync(frame);
    const r2 = await run(['proof', frame, '--out', dir]);
    expect(r2.code).toBe(5);
    expect(r2.stderr).toMatch(/holds files eyeproof did not write/);
    expect(readFileSync(frame).equals(before)).toBe(true);
    // A frame named like an output, inside the output folder, is never overwritten.
    const named = join(dir, 'clash');
    mkdirSync(named);
    copyFileSync(frame, join(named, 'percept.png'));
    const r3 = await run(['proof', join(named, 'percept.png'), '--out', named]);
    expect(r3.code).toBe(5);
    expect(r3.stderr).toMatch(/input/);
    expect(readFileSync(join(named, 'percept.png')).equals(before)).toBe(true);
  });

  test('a labels file beside the frame is found and judged; a broken one exits 4', async () => {
    const labelled = join(dir, 'labelled.png');
    copyFileSync(frame, labelled);
    writeFileSync(join(dir, 'labelled.labels.json'), JSON.stringify({ labels: [{ id: 'bar', text: 'WHITE BAR', boxPx: [300, 160, 200, 40], letterHeightPx: 30 }] }));
    const r = await run(['proof', labelled, '--json', '--out', join(dir, 'labelled-out')]);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout);
    expect(report.labels.verdicts[0].id).toBe('bar');
    expect(['readable', 'legible', 'not legible']).toContain(report.labels.verdicts[0].fromGaze.verdict);
    writeFileSync(join(dir, 'broken.labels.json'), JSON.stringify({ labels: [{ id: 'x', text: 'X', boxPx: [0, 0, 9999, 10], letterHeightPx: 5 }] }));
    const bad = await run(['proof', labelled, '--labels', join(dir, 'broken.labels.json'), '--out', join(dir, 'broken-out')]);
    expect(bad.code).toBe(4);
    expect(bad.stderr).toMatch(/labels\[0\] \("x"\)\.boxPx/);
  });

  test('an unknown option is a usage error, exit 2', async () => {
    const r = await run(['proof', frame, '--colour', 'red']);
    expect(r.code).toBe(2);
  });

  test('--percept-mode and --reference-viewer choose what percept.png shows, and the report says so', async () => {
    const retinal = await run(['proof', frame, '--percept-mode', 'retinal-image', '--json', '--out', join(dir, 'retinal')]);
    expect(retinal.code).toBe(0);
    expect(JSON.parse(retinal.stdout).percept).toEqual({ mode: 'retinal-image', modeFrom: 'command line' });
    const shown = await run(['proof', frame, '--viewer', 'age-70', '--reference-viewer', 'age-45', '--json', '--out', join(dir, 'shown')]);
    expect(shown.code).toBe(0);
    const report = JSON.parse(shown.stdout);
    expect(report.percept).toMatchObject({ mode: 'same-display', referenceViewer: { name: 'age-45', ageYears: 45 }, opticsCancel: false });
    expect(report.models.find((m: { stage: string }) => m.stage === 'percept').name).toBe('same-display');
    const bad = await run(['proof', frame, '--percept-mode', 'fisheye', '--out', join(dir, 'bad-mode')]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/same-display/);
  });

  test('sizes prints the smallest passing capital height at 0, 2, 5, 10 and 20° as a table, Markdown and JSON, with an audience share', async () => {
    const table = await run(['sizes', '--setup', 'desktop-27in', '--viewer', 'age-55']);
    expect(table.code).toBe(0);
    expect(table.stdout).toMatch(/cap height px/);
    const md = await run(['sizes', '--setup', 'desktop-27in', '--format', 'markdown', '--audience', '90']);
    expect(md.stdout).toMatch(/\| from gaze ° \| cap height px \|/);
    expect(md.stdout).toMatch(/cap px for 90 % corrected/);
    const json = JSON.parse((await run(['sizes', '--setup', 'desktop-27in', '--format', 'json', '--audience', '90'])).stdout);
    expect(json.rows.map((r: { eccentricityDeg: number }) => r.eccentricityDeg)).toEqual([0, 2, 5, 10, 20]);
    expect(json.rows[4].capHeight.px).toBeGreaterThan(json.rows[0].capHeight.px);
    const bad = await run(['sizes', '--audience', '120']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/percent/);
  });

  test('labels finds text runs and writes a labels file to correct; it never overwrites one, nor the frame', async () => {
    const sub = join(dir, 'labels-cmd');
    mkdirSync(sub);
    const f = join(sub, 'console.png');
    copyFileSync(join(root, 'sample-scenes/picker-headset.png'), f);
    const first = await run(['labels', f]);
    expect(first.code).toBe(0);
    const written = JSON.parse(readFileSync(join(sub, 'console.labels.json'), 'utf8'));
    expect(written.labels.length).toBeGreaterThanOrEqual(9);
    const again = await run(['labels', f]);
    expect(again.code).toBe(5);
    expect(again.stderr).toMatch(/exists already.*--force/s);
    const onFrame = await run(['labels', f, '--out', f, '--force']);
    expect(onFrame.code).toBe(5);
    expect(onFrame.stderr).toMatch(/is one of the inputs/);
  });

  test('without a labels file, proof judges the text runs it finds and says so', async () => {
    const sub = join(dir, 'found');
    mkdirSync(sub);
    const f = join(sub, 'picker.png');
    copyFileSync(join(root, 'sample-scenes/picker-headset.png'), f);
    const r = await run(['proof', f, '--setup', join(root, 'sample-scenes/picker-headset.setup.json'), '--out', join(sub, 'out')]);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/no labels file, so \d+ text runs found in the frame are judged/);
    const report = JSON.parse(readFileSync(join(sub, 'out', 'report.json'), 'utf8'));
    expect(report.labels.verdicts.length).toBeGreaterThanOrEqual(9);
    const none = await run(['proof', f, '--setup', join(root, 'sample-scenes/picker-headset.setup.json'), '--no-detect-labels', '--out', join(sub, 'out2')]);
    expect(none.stderr).toMatch(/no labels, so no verdicts/);
  });

  test('an SVG export gives the labels: proof --labels frame.svg, and labels --from-svg writes them (SVG 1.1 text elements)', async () => {
    const sub = join(dir, 'svg');
    mkdirSync(sub);
    const f = join(sub, 'picker.png');
    copyFileSync(join(root, 'sample-scenes/picker-headset.png'), f);
    const svg = join(root, 'sample-scenes/picker-headset.text.svg');
    const r = await run(['proof', f, '--setup', join(root, 'sample-scenes/picker-headset.setup.json'), '--labels', svg, '--out', join(sub, 'out')]);
    expect(r.code).toBe(0);
    const report = JSON.parse(readFileSync(join(sub, 'out', 'report.json'), 'utf8'));
    expect(report.labels.verdicts.map((v: { id: string }) => v.id)).toContain('aisle');
    const w = await run(['labels', f, '--from-svg', svg]);
    expect(w.code).toBe(0);
    expect(JSON.parse(readFileSync(join(sub, 'picker.labels.json'), 'utf8')).labels.length).toBe(9);
  });

  test('a sweep of 2 frames × 2 ages writes a folder per frame and viewer, a contact sheet, two viewers compared and sweep.json', async () => {
    const sub = join(dir, 'sweep');
    mkdirSync(sub);
    const a = join(sub, 'a.png');
    const b = join(sub, 'b.png');
    await sharp(join(root, 'sample-scenes/ferry-console.png')).resize(640, 360).png().toFile(a);
    await sharp(join(root, 'sample-scenes/ferry-console-night.png')).resize(640, 360).png().toFile(b);
    const out = join(sub, 'out');
    const r = await run(['proof', a, b, '--age', '25,70', '--distance', '600', '--out', out]);
    expect(r.code).toBe(0);
    expect(readdirSync(out).sort()).toEqual(['a', 'b', 'compare-viewers.png', 'contact-sheet.png', 'sweep.html', 'sweep.json']);
    expect(readdirSync(join(out, 'a')).sort()).toEqual(['age-25-600mm', 'age-70-600mm']);
    expect(readdirSync(join(out, 'a', 'age-70-600mm'))).toContain('review.html');
    const sweep = JSON.parse(readFileSync(join(out, 'sweep.json'), 'utf8'));
    expect(sweep.proofs.length).toBe(4);
    expect(sweep.viewerDifferences.join(' ')).toMatch(/defocus .* D/);
    const sheet = await sharp(join(out, 'contact-sheet.png')).metadata();
    // Two columns of 480 px thumbnails with 16 px gaps.
    expect(sheet.width).toBe(16 + 2 * (480 + 16));
    // A second sweep may replace the first (its folder holds sweep.json).
    expect((await run(['proof', a, '--age', '30,40', '--out', out, '-q'])).code).toBe(0);
    expect(readdirSync(out).sort()).toEqual(['a', 'compare-viewers.png', 'contact-sheet.png', 'sweep.html', 'sweep.json']);
    expect((await run(['proof', a, b, '--json', '--age', '30,40', '--out', join(sub, 'j')])).code).toBe(2);
  }, 180_000);

  test('a misspelt preset gets the nearest name', async () => {
    const r = await run(['numbers', '--viewer', 'agee-70']);
    expect(r.code).toBe(3);
    expect(r.stderr).toMatch(/did you mean "age-70"/);
  });
});
