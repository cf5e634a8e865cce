/**
 * A real headless Chromium for browser-facing tests: Debian's `chromium` package driven by
 * playwright-core (never a downloaded browser), with a fresh profile folder each time.
 */
import { existsSync, mkdirSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';

export const CHROMIUM = '/usr/bin/chromium';
/** Where screenshots are kept for people to look at (ignored by git, kept by CI). */
export const ARTEFACTS = join(import.meta.dirname, '..', '..', 'test-artefacts');

export async function launchChromium(): Promise<BrowserContext> {
  if (!existsSync(CHROMIUM)) throw new Error(`${CHROMIUM} is missing: install Debian's chromium package (apt-get install chromium), as .ci/run does`);
  mkdirSync(ARTEFACTS, { recursive: true });
  return chromium.launchPersistentContext(mkdtempSync(join(tmpdir(), 'eyeproof-chromium-')), {
    executablePath: CHROMIUM,
    headless: true,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run'],
    viewport: { width: 1366, height: 900 },
  });
}
