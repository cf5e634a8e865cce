/**
 * The live preview: its security rules over plain HTTP, a load test from a second process
 * (autocannon), and the page in a real headless Chromium (Debian chromium via playwright-core).
 */
import { execFile } from 'node:child_process';
import { request } from 'node:http';
import { join } from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import type { BrowserContext } from 'playwright-core';
import { MAX_JSON_BYTES, startPreviewServer, type PreviewServer } from '../../src/serve/preview-server.js';
import { ARTEFACTS, launchChromium } from '../helpers/browser.js';

let preview: PreviewServer;
let port: number;

beforeAll(async () => {
  preview = await startPreviewServer();
  port = Number(new URL(preview.url).port);
});

afterAll(async () => {
  await preview?.close();
});

function call(path: string, options: { method?: string; headers?: Record<string, string>; body?: Buffer | string } = {}): Promise<{ status: number; headers: Record<string, unknown>; body: string }> {
  return new Promise((resolve, reject) => {
    const req = request({ host: '127.0.0.1', port, path, method: options.method ?? 'GET', headers: { Host: `127.0.0.1:${port}`, ...options.headers } }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks).toString() }));
    });
    req.on('error', reject);
    if (options.body) req.write(options.body);
    req.end();
  });
}

const tinyFrame = (): Promise<Buffer> => sharp('sample-scenes/ferry-console.png').resize(320, 180).png().toBuffer();

describe('the preview serves only its user (OWASP: DNS rebinding, CSP, request limits)', () => {
  test('binds to 127.0.0.1 by default and sends a strict Content Security Policy', async () => {
    expect(preview.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/$/);
    const page = await call('/');
    expect(page.status).toBe(200);
    expect(String(page.headers['content-security-policy'])).toMatch(/default-src 'none'; script-src 'self'/);
    expect(page.headers['x-content-type-options']).toBe('nosniff');
  });

  test('refuses a foreign Host (DNS rebinding) and a foreign Origin', async () => {
    expect((await call('/', { headers: { Host: `attacker.example:${port}` } })).status).toBe(403);
    expect((await call('/api/displays', { headers: { Origin: 'http://attacker.example' } })).status).toBe(403);
    expect((await call('/api/displays', { headers: { Origin: `http://127.0.0.1:${port}` } })).status).toBe(200);
  });

  test('never reads a path a request names, and caps bodies', async () => {
    for (const path of ['/../../etc/passwd', '/%2e%2e/%2e%2e/etc/passwd', '/package.json', '/src/serve/preview-server.ts']) {
      const r = await call(path);
      expect(r.status).toBe(404);
      expect(r.body).not.toMatch(/root:|"name"|import/);
    }
    const big = await call('/api/look', { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: 'x'.repeat(MAX_JSON_BYTES + 10) });
    expect(big.status).toBe(413);
    const bad = await call('/api/frame', { method: 'POST', body: Buffer.from('not an image') });
    expect(bad.status).toBe(422);
  });

  test('holds 50 clients for 30 s from a second process (autocannon) with no errors and bounded memory', async () => {
    const frame = JSON.parse((await call('/api/frame', { method: 'POST', body: await tinyFrame() })).body) as { frameId: string };
    const look = JSON.stringify({ frameId: frame.frameId, gazePx: [160, 90], display: 'desktop-27in', distanceMm: 700, ageYears: 40, sphereD: 0, pupilMm: 'auto', lightCdM2: 'auto' });
    const before = process.memoryUsage().rss;
    const script = `
      const autocannon = require('autocannon');
      autocannon({ url: ${JSON.stringify(preview.url)}, connections: 50, duration: 30, timeout: 20,
        requests: [{ method: 'GET', path: '/' }, { method: 'GET', path: '/api/displays' }, { method: 'POST', path: '/api/look', headers: { 'content-type': 'application/json' }, body: ${JSON.stringify(look)} }] },
        (err, r) => { if (err) { console.error(err); process.exit(1); } console.log(JSON.stringify({ requests: r.requests.total, errors: r.errors, timeouts: r.timeouts, non2xx: r.non2xx, p99: r.latency.p99 })); });`;
    const out = await new Promise<string>((resolve, reject) => execFile(process.execPath, ['-e', script], { cwd: join(import.meta.dirname, '..', '..') }, (err, stdout, stderr) => (err ? reject(new Error(stderr)) : resolve(stdout))));
    const r = JSON.parse(out.trim().split('\n').pop()!) as { requests: number; errors: number; timeouts: number; non2xx: number; p99: number };
    expect(r.errors).toBe(0);
    expect(r.timeouts).toBe(0);
    expect(r.non2xx).toBe(0);
    expect(r.requests).toBeGreaterThan(500);
    expect(process.memoryUsage().rss - before).toBeLessThan(400 * 1024 * 1024);
  }, 90_000);
});

describe('the preview page in headless Chromium', () => {
  let browser: BrowserContext;
  beforeAll(async () => {
    browser = await launchChromium();
  });
  afterAll(async () => {
    await browser?.close();
  });

  test('a frame can be opened, a click moves the gaze and changes the percept, a change of age changes the verdicts', async () => {
    const tab = await browser.newPage();
    const errors: string[] = [];
    tab.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
    tab.on('pageerror', (e) => errors.push(String(e)));
    await tab.goto(preview.url);
    await tab.waitForSelector('body[data-ready="true"]');
    const frame = await sharp('sample-scenes/ferry-console.png').resize(1280, 720).png().toBuffer();
    await tab.locator('#file').setInputFiles({ name: 'console.png', mimeType: 'image/png', buffer: frame });
    await tab.waitForSelector('body[data-looks="1"]', { timeout: 60_000 });
    const first = await tab.locator('#percept').getAttribute('src');
    const verdictsAt = async (): Promise<string[]> => tab.locator('#verdict-list li').evaluateAll((lis) => lis.map((li) => `${(li as HTMLElement).dataset.id}:${(li as HTMLElement).dataset.verdict}`));
    const young = await verdictsAt();
    expect(young.length).toBeGreaterThan(20);

    const box = (await tab.locator('#percept').boundingBox())!;
    await tab.mouse.click(box.x + box.width * 0.2, box.y + box.height * 0.8);
    await tab.waitForSelector('body[data-looks="2"]', { timeout: 30_000 });
    expect(await tab.locator('#percept').getAttribute('src')).not.toBe(first);
    expect(await tab.locator('#percept').getAttribute('data-gaze')).not.toBe('640,360');
    await tab.screenshot({ path: join(ARTEFACTS, 'preview-gaze.png') });

    await tab.locator('#age').evaluate((el) => { (el as HTMLInputElement).value = '75'; el.dispatchEvent(new Event('input')); el.dispatchEvent(new Event('change')); });
    await tab.waitForSelector('body[data-looks="3"]', { timeout: 60_000 });
    expect(await verdictsAt()).not.toEqual(young);
    await tab.screenshot({ path: join(ARTEFACTS, 'preview-age-75.png') });
    expect(errors).toEqual([]);
    await tab.close();
  }, 120_000);
});
