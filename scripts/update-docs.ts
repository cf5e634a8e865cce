/**
 * Rewrites the generated parts of the README (setup reference, presets) and setup.schema.json from
 * the declarations. `npm run docs`; a test fails when they are out of date.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { generatedDocs } from '../src/config/generated-docs.js';

const root = join(import.meta.dirname, '..');
const readmePath = join(root, 'README.md');
const docs = generatedDocs(readFileSync(readmePath, 'utf8'));
writeFileSync(readmePath, docs.readme);
writeFileSync(join(root, 'setup.schema.json'), docs.schema);
