/**
 * Regression snapshots of the rendered outputs (values produced by our own code and pinned, not
 * outside references). Refresh after an intended change with:
 *   EYEPROOF_UPDATE_GOLDENS=1 npx vitest run tests/render/golden.test.ts
 * then open the PNGs in tests/golden/ and judge them before committing.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import sharp from 'sharp';
import { PNG } from 'pngjs';
import { beforeAll, describe, expect, test } from 'vitest';
import { validateSetup } from '../../src/config/validate.js';
import { proofFrame, type ProofOutputs } from '../../src/proof.js';

const goldenDir = join(import.meta.dirname, '..', 'golden');
const update = process.env.EYEPROOF_UPDATE_GOLDENS === '1';

/** Largest per-channel difference allowed, and the share of pixels that may reach it (rasteriser noise). */
const MAX_LEVEL_DIFF = 3;
const MAX_DIFFERING_SHARE = 0.002;

let outputs: ProofOutputs;

beforeAll(async () => {
  const frame = await sharp(join(import.meta.dirname, '..', '..', 'sample-scenes', 'ferry-console.png')).resize(640, 360).png().toBuffer();
  const setup = validateSetup({ display: { preset: 'desktop-27in' }, viewer: { preset: 'age-55' }, gaze: { xPx: 320, yPx: 180 } }, 'golden setup');
  outputs = await proofFrame(frame, 'ferry-console-640.png', setup, 'golden setup');
});

describe('golden images (regression snapshots)', () => {
  test.each(['percept.png', 'detail-map.png', 'compare.png'])('%s matches tests/golden (regression snapshot)', (name) => {
    const file = outputs.files.find((f) => f.name === name)!;
    const golden = join(goldenDir, `ferry-console-640-${name}`);
    if (update || !existsSync(golden)) {
      writeFileSync(golden, file.bytes);
      if (!update) throw new Error(`${golden} was missing and has been written; check it and commit it`);
      return;
    }
    const a = PNG.sync.read(Buffer.from(file.bytes as Uint8Array));
    const b = PNG.sync.read(readFileSync(golden));
    expect([a.width, a.height]).toEqual([b.width, b.height]);
    let differing = 0;
    let worst = 0;
    for (let i = 0; i < a.data.length; i++) {
      const d = Math.abs(a.data[i] - b.data[i]);
      worst = Math.max(worst, d);
      if (d > MAX_LEVEL_DIFF) differing++;
    }
    expect(differing / a.data.length, `worst difference ${worst} levels`).toBeLessThanOrEqual(MAX_DIFFERING_SHARE);
  });
});
