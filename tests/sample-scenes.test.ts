import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import sharp from 'sharp';
import { describe, expect, test } from 'vitest';

const dir = join(import.meta.dirname, '..', 'sample-scenes');
const scenes = readdirSync(dir).filter((f) => f.endsWith('.labels.json'));

describe('sample scenes (demo data)', () => {
  test('there are the five demo scenes', () => {
    expect(scenes.sort()).toEqual(['calibration-chart.labels.json', 'ferry-console-banner.labels.json', 'ferry-console-night.labels.json', 'ferry-console.labels.json', 'picker-headset.labels.json']);
  });

  test.each(scenes)('%s: every label box lies inside its frame and has a letter height', async (file) => {
    const labels = JSON.parse(readFileSync(join(dir, file), 'utf8'));
    const meta = await sharp(join(dir, labels.frame)).metadata();
    expect(labels.labels.length).toBeGreaterThan(3);
    for (const l of labels.labels) {
      const [x, y, w, h] = l.boxPx;
      expect(x).toBeGreaterThanOrEqual(0);
      expect(y).toBeGreaterThanOrEqual(0);
      expect(x + w).toBeLessThanOrEqual(meta.width!);
      expect(y + h).toBeLessThanOrEqual(meta.height!);
      expect(l.letterHeightPx).toBeGreaterThan(0);
      expect(l.letterHeightPx).toBeLessThanOrEqual(h);
    }
  });

  test('calibration chart letters have the stated angular capital heights on desktop-27in (1.1466′ per px at the centre, derived)', () => {
    const labels = JSON.parse(readFileSync(join(dir, 'calibration-chart.labels.json'), 'utf8')).labels as { id: string; letterHeightPx: number }[];
    for (const arcmin of [10, 20, 40]) {
      const l = labels.find((x) => x.id === `letters-${arcmin}`)!;
      expect(l.letterHeightPx * 1.1466).toBeGreaterThan(arcmin * 0.9);
      expect(l.letterHeightPx * 1.1466).toBeLessThan(arcmin * 1.1);
    }
  });
});
