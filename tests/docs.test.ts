import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { expect, test } from 'vitest';
import { generatedDocs } from '../src/config/generated-docs.js';

const root = join(import.meta.dirname, '..');

test('README setup reference, presets and setup.schema.json are generated from the declarations (run `npm run docs`)', () => {
  const readme = readFileSync(join(root, 'README.md'), 'utf8');
  const docs = generatedDocs(readme);
  expect(readme).toBe(docs.readme);
  expect(readFileSync(join(root, 'setup.schema.json'), 'utf8')).toBe(docs.schema);
});

test('README starts with the job paragraph and gives exactly the two set-up commands', () => {
  const readme = readFileSync(join(root, 'README.md'), 'utf8');
  expect(readme.split('\n').find((l) => l.startsWith('**eyeproof**'))).toBeDefined();
  const block = /```sh\n([\s\S]*?)```/.exec(readme)![1].trim().split('\n');
  expect(block.map((l) => l.split('#')[0].trim())).toEqual(['npm ci && npm run demo', 'apt-get install -y chromium redis-server && npm ci && npm test']);
  // CI installs the same Debian packages and runs the same test command.
  const ci = readFileSync(join(root, '.ci', 'run'), 'utf8');
  for (const part of ['chromium', 'redis-server', 'npm ci', 'npm test']) expect(ci).toContain(part);
  expect(readme).toMatch(/not a medical device/);
});
