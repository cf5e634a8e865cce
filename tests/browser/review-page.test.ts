/** review.html in a real headless Chromium: self-contained, the slider and switches work, the table is the report's. */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import type { BrowserContext } from 'playwright-core';
import { validateSetup } from '../../src/config/validate.js';
import { proofFrame } from '../../src/proof.js';
import { ARTEFACTS, launchChromium } from '../helpers/browser.js';

let browser: BrowserContext;
let page: string;
let report: { labels: { verdicts: { id: string; verdict: string }[] } };

beforeAll(async () => {
  const dir = mkdtempSync(join(tmpdir(), 'eyeproof-review-'));
  const frame = await sharp('sample-scenes/ferry-console.png').resize(1280, 720).png().toBuffer();
  const labels = JSON.parse(readFileSync('sample-scenes/ferry-console.labels.json', 'utf8')) as { labels: { boxPx: number[]; letterHeightPx: number }[] };
  for (const l of labels.labels) {
    l.boxPx = l.boxPx.map((v) => v / 2);
    l.letterHeightPx /= 2;
  }
  const setup = validateSetup({ display: { preset: 'desktop-27in' }, viewer: { preset: 'age-55' }, frame: { pixelRatio: 0.5 } }, 'test');
  const out = await proofFrame(frame, 'ferry-console-1280.png', setup, 'test', { labels: { file: 'l.json', text: JSON.stringify(labels) }, gaze: '50%,55%; label:alarm' });
  page = join(dir, 'review.html');
  writeFileSync(page, out.files.find((f) => f.name === 'review.html')!.bytes);
  report = out.report as typeof report;
  browser = await launchChromium();
}, 120_000);

afterAll(async () => {
  await browser?.close();
});

describe('review.html in headless Chromium (Debian chromium via playwright-core)', () => {
  test('opens from disk with no network request and no console error; the slider moves; the switches change the view; the table is report.json\'s', async () => {
    const tab = await browser.newPage();
    const outside: string[] = [];
    const errors: string[] = [];
    tab.on('request', (r) => { if (!/^(file|data):/.test(r.url())) outside.push(r.url()); });
    tab.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
    tab.on('pageerror', (e) => errors.push(String(e)));
    await tab.goto(pathToFileURL(page).href);
    await tab.waitForLoadState('load');
    expect(outside).toEqual([]);
    expect(errors).toEqual([]);

    // The slider: the percept is clipped from the handle's position.
    await tab.locator('#slider-range').fill('20');
    expect(await tab.locator('#slider-after').evaluate((e) => (e as HTMLElement).style.clipPath)).toBe('inset(0px 0px 0px 20%)');
    await tab.screenshot({ path: join(ARTEFACTS, 'review-slider.png'), fullPage: false });

    // The switches: one view at a time.
    await tab.getByRole('button', { name: 'Detail map' }).click();
    expect(await tab.locator('#view-detail').isVisible()).toBe(true);
    expect(await tab.locator('#view-slider').isVisible()).toBe(false);
    await tab.getByRole('button', { name: 'Reach' }).click();
    expect(await tab.locator('#view-reach').isVisible()).toBe(true);
    expect(await tab.locator('#view-detail').isVisible()).toBe(false);
    await tab.screenshot({ path: join(ARTEFACTS, 'review-reach.png'), fullPage: false });

    // The label table: every label of the report with its verdict.
    const rows = await tab.locator('#labels tbody tr').evaluateAll((trs) => trs.map((tr) => ({ id: tr.getAttribute('data-id'), verdict: (tr.children[3] as HTMLElement).innerText.replace(/^[✓–✗]\s*/, '') })));
    expect(rows.length).toBe(report.labels.verdicts.length);
    for (const v of report.labels.verdicts) expect(rows.find((r) => r.id === v.id)?.verdict).toBe(v.verdict);
    // The fixations of the gaze list: a table, and their percepts to step through.
    expect(await tab.locator('#fixations tbody tr').count()).toBe(2);
    await tab.getByRole('button', { name: 'Fixations (2)' }).click();
    expect(await tab.locator('#fixation-0').isVisible()).toBe(true);
    await tab.getByRole('button', { name: 'label:alarm' }).click();
    expect(await tab.locator('#fixation-1').isVisible()).toBe(true);
    expect(await tab.locator('#fixation-0').isVisible()).toBe(false);
    await tab.screenshot({ path: join(ARTEFACTS, 'review-full.png'), fullPage: true });
    await tab.close();
  }, 60_000);

  test('prints to PDF with every view shown', async () => {
    const tab = await browser.newPage();
    await tab.goto(pathToFileURL(page).href);
    await tab.emulateMedia({ media: 'print' });
    for (const id of ['#view-slider', '#view-detail', '#view-reach', '#view-audience', '#view-compare']) expect(await tab.locator(id).isVisible()).toBe(true);
    const pdf = await tab.pdf({ format: 'A4' });
    expect(pdf.subarray(0, 4).toString()).toBe('%PDF');
    await tab.close();
  }, 60_000);
});
