/**
 * The README's pictures are the demo's outputs (`npm run demo`: the ferry console with built-in
 * defaults), scaled down for the page. Run `npm run pictures` after a change that alters them.
 */
import { existsSync, mkdirSync } from 'node:fs';
import { join } from 'node:path';
import sharp from 'sharp';

const root = join(import.meta.dirname, '..');
const demo = join(root, 'eyeproof-out', 'ferry-console');
if (!existsSync(join(demo, 'compare-slide.png'))) throw new Error('run `npm run demo` first');
mkdirSync(join(root, 'docs'), { recursive: true });
for (const [from, to, width] of [['compare-slide.png', 'compare-ferry-console.png', 1600], ['detail-map.png', 'detail-map-ferry-console.png', 1280], ['reach.png', 'reach-ferry-console.png', 1280], ['audience.png', 'audience-ferry-console.png', 900], ['psf.png', 'psf-ferry-console.png', 0]] as const) {
  const image = sharp(join(demo, from));
  await (width ? image.resize({ width, kernel: 'lanczos3' }) : image).png({ compressionLevel: 9 }).toFile(join(root, 'docs', to));
  process.stdout.write(`docs/${to}\n`);
}
