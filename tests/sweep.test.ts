import sharp from 'sharp';
import { describe, expect, test } from 'vitest';
import { validateSetup } from '../src/config/validate.js';
import { runSweep } from '../src/sweep.js';

describe('sweeps', () => {
  test('a gaze list gives a contact-sheet row per gaze, and two viewers are compared with what differs (Hofstetter 1950: less accommodation at 70)', async () => {
    const bytes = new Uint8Array(await sharp('sample-scenes/ferry-console.png').resize(320, 180).png().toBuffer());
    const variants = [25, 70].map((age) => ({ name: `age-${age}`, setup: validateSetup({ viewer: { ageYears: age } }, 't'), source: 't' }));
    const { files, done } = await runSweep([{ file: 'a.png', bytes, name: 'a', inputs: { gaze: '50%,50%; 20%,80%', detectLabels: true } }], variants, () => {}, () => {});
    expect(done.map((d) => d.fixationThumbs?.map((f) => f.given))).toEqual([['50%,50%', '20%,80%'], ['50%,50%', '20%,80%']]);
    const sheet = await sharp(Buffer.from(files.find((f) => f.name === 'contact-sheet.png')!.bytes as Uint8Array)).metadata();
    // Two rows of 480-px-wide thumbnails of a 16:9 frame (270 px) with 44 px captions and 16 px gaps, under a 56 px header.
    expect(sheet.height).toBe(56 + 2 * (270 + 44 + 16) + 28);
    const sweep = JSON.parse(files.find((f) => f.name === 'sweep.json')!.bytes as string);
    expect(sweep.viewerDifferences[0]).toMatch(/accommodation .* → 0\.0 D/);
    expect(files.filter((f) => f.name.endsWith('/review.html')).length).toBe(2);
  }, 120_000);
});
