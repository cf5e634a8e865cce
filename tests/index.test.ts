import { expect, test } from 'vitest';
import * as api from '../src/index.js';

test('the library API exports exactly this list (regression snapshot of the public surface)', () => {
  expect(Object.keys(api).sort()).toEqual([
    'CAUTIONS', 'ConfigError', 'InputError', 'OutputError', 'PROOF_OUTPUT_NAMES', 'computeNumbers', 'decodeFrame',
    'detectLabelsInFrame', 'detectTextRuns', 'displayPresets', 'lookAt', 'mergeSetupJson', 'numbersReport', 'prepareProof', 'proofFrame',
    'resolveGazeSpec', 'runProof', 'setupJsonSchema', 'sizeSpec', 'validateSetup', 'viewerPresets', 'virtualImageDistanceM',
  ]);
});

test('the version in the code is package.json\'s (common practice: one version)', async () => {
  const { EYEPROOF_VERSION } = await import('../src/version.js');
  const pkg = JSON.parse((await import('node:fs')).readFileSync(new URL('../package.json', import.meta.url), 'utf8'));
  expect(EYEPROOF_VERSION).toBe(pkg.version);
});
