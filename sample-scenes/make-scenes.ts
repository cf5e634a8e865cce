/**
 * Renders the demo frames of our invented scenario (a harbour logistics company) and the calibration
 * chart, with a labels file for each. Run `npm run scenes`; the output is the same bit for bit on
 * the same package versions. All names and data here are invented.
 */
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { SKRSContext2D } from '@napi-rs/canvas';
import sharp from 'sharp';
import { font, newCanvas } from '../src/render/canvas.js';

const here = dirname(fileURLToPath(import.meta.url));

interface Label {
  id: string;
  text: string;
  boxPx: [number, number, number, number];
  letterHeightPx: number;
  letterSpacingPx: number;
  role?: 'glance' | 'look' | 'decorative';
}

/**
 * Roles of the demo's labels: readouts a watch officer checks without looking away from the radar
 * are `glance`; everything else is read when looked at (`look`, the default).
 */
const GLANCE_LABELS = new Set(['heading-value', 'speed-value', 'alarm', 'banner', 'clock', 'aisle', 'timer']);

/** XML text with &, < and > escaped. */
const xml = (t: string): string => t.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

class Scene {
  readonly labels: Label[] = [];
  /** The text layer as an SVG export would carry it (positions at the baseline, font size in px). */
  readonly svgTexts: string[] = [];
  readonly g: SKRSContext2D;
  readonly canvas;
  constructor(readonly name: string, readonly width: number, readonly height: number) {
    const { canvas, g } = newCanvas(width, height);
    this.canvas = canvas;
    this.g = g;
  }

  /** Draws text with its top-left at (x, y) and records it as a label with its measured cap height. */
  text(id: string, text: string, x: number, y: number, sizePx: number, colour: string, bold = false): number {
    const g = this.g;
    g.font = font(sizePx, bold);
    g.fillStyle = colour;
    g.textBaseline = 'alphabetic';
    const capHeight = g.measureText('H').actualBoundingBoxAscent;
    const m = g.measureText(text);
    const baseline = y + Math.ceil(m.actualBoundingBoxAscent);
    g.fillText(text, x, baseline);
    const role = GLANCE_LABELS.has(id) ? ' data-role="glance"' : '';
    this.svgTexts.push(`  <text id="${xml(id)}"${role} x="${x}" y="${baseline}" font-family="IBM Plex Sans" font-size="${sizePx}" font-weight="${bold ? 600 : 400}" fill="${colour}">${xml(text)}</text>`);
    const widthPx = Math.ceil(m.width);
    const heightPx = Math.ceil(m.actualBoundingBoxAscent + m.actualBoundingBoxDescent);
    // Letter spacing as the mean advance minus the mean glyph width is not exposed; use the gap of "II".
    const gap = g.measureText('II').width - 2 * g.measureText('I').actualBoundingBoxRight;
    this.labels.push({ id, text, boxPx: [Math.round(x), Math.round(y), widthPx, heightPx], letterHeightPx: Math.round(capHeight * 10) / 10, letterSpacingPx: Math.round(gap * 10) / 10 });
    return widthPx;
  }

  rect(x: number, y: number, w: number, h: number, colour: string, radius = 0): void {
    const g = this.g;
    g.fillStyle = colour;
    g.beginPath();
    g.roundRect(x, y, w, h, radius);
    g.fill();
  }

  async save(): Promise<void> {
    const rgba = this.g.getImageData(0, 0, this.width, this.height).data;
    const png = await sharp(Buffer.from(rgba.buffer, rgba.byteOffset, rgba.byteLength), { raw: { width: this.width, height: this.height, channels: 4 } })
      .removeAlpha().png({ compressionLevel: 9 }).toBuffer();
    writeFileSync(join(here, `${this.name}.png`), png);
    const labels = this.labels.map((l) => (GLANCE_LABELS.has(l.id) ? { ...l, role: 'glance' as const } : l));
    writeFileSync(join(here, `${this.name}.labels.json`), `${JSON.stringify({ frame: `${this.name}.png`, labels }, null, 2)}\n`);
    // The text layer as a design tool exports it, for the SVG import (shapes are left out).
    writeFileSync(join(here, `${this.name}.text.svg`), `<svg xmlns="http://www.w3.org/2000/svg" width="${this.width}" height="${this.height}" viewBox="0 0 ${this.width} ${this.height}">\n${this.svgTexts.join('\n')}\n</svg>\n`);
  }
}

/** Colours of the ferry console: a day palette and a dim night palette (dark background, amber text). */
interface ConsolePalette {
  background: string;
  titleBar: string;
  titleText: string;
  panel: string;
  caption: string;
  value: string;
  fine: string;
  radar: string;
  radarRing: string;
  target: string;
  alarm: string;
  alarmText: string;
}

const DAY: ConsolePalette = {
  background: '#dfe3e8', titleBar: '#1f3a5a', titleText: '#ffffff', panel: '#ffffff', caption: '#4a5563', value: '#10263f',
  fine: '#6b7480', radar: '#0f2238', radarRing: '#3f7f6a', target: '#8ff0c0', alarm: '#ffb020', alarmText: '#1a1300',
};

const NIGHT: ConsolePalette = {
  background: '#000000', titleBar: '#0b0b0b', titleText: '#b36b00', panel: '#0d0d0d', caption: '#6b4100', value: '#c07a10',
  fine: '#553300', radar: '#050a08', radarRing: '#1d3b2f', target: '#2f8a5e', alarm: '#5a1500', alarmText: '#ff9a60',
};

/** Ferry bridge console for a 27-inch 2560×1440 screen at about 70 cm, in a day or night palette. */
async function ferryConsole(name: string, c: ConsolePalette, banner = false): Promise<void> {
  const s = new Scene(name, 2560, 1440);
  const g = s.g;
  s.rect(0, 0, 2560, 1440, c.background);
  s.rect(0, 0, 2560, 96, c.titleBar);
  s.text('title', 'MV Harbour Wren · Bridge console', 40, 30, 40, c.titleText, true);
  s.text('clock', '14:32 UTC', 2330, 30, 40, c.titleText, true);
  // Heading and speed tiles.
  s.rect(40, 140, 560, 300, c.panel, 16);
  s.text('heading-caption', 'HEADING', 72, 170, 22, c.caption, true);
  s.text('heading-value', '274°', 72, 220, 120, c.value, true);
  s.rect(640, 140, 560, 300, c.panel, 16);
  s.text('speed-caption', 'SPEED OVER GROUND', 672, 170, 22, c.caption, true);
  s.text('speed-value', '11.4 kn', 672, 220, 120, c.value, true);
  // Radar-like plot in the centre.
  g.fillStyle = c.radar;
  g.beginPath();
  g.arc(1280, 820, 420, 0, Math.PI * 2);
  g.fill();
  g.strokeStyle = c.radarRing;
  g.lineWidth = 3;
  for (const r of [105, 210, 315, 420]) {
    g.beginPath();
    g.arc(1280, 820, r, 0, Math.PI * 2);
    g.stroke();
  }
  for (const [x, y, id, label] of [[1420, 700, 'target-a', 'TUG 2'], [1120, 980, 'target-b', 'PILOT'], [1500, 1010, 'target-c', 'BUOY 7']] as const) {
    g.fillStyle = c.target;
    g.beginPath();
    g.arc(x, y, 9, 0, Math.PI * 2);
    g.fill();
    s.text(id, label, x + 16, y - 10, 18, c.target, true);
  }
  s.text('range', 'Range 3 nm', 1200, 1262, 20, c.caption);
  // Route list on the right.
  s.rect(1800, 140, 720, 760, c.panel, 16);
  s.text('route-caption', 'ROUTE · Northquay → Saltmere', 1832, 170, 24, c.caption, true);
  const legs = [['WP1', 'Harbour mouth', '0.8 nm', '14:36'], ['WP2', 'Channel buoy 7', '2.1 nm', '14:44'], ['WP3', 'Outer mark', '4.6 nm', '14:57'], ['WP4', 'Saltmere approach', '9.3 nm', '15:22']];
  legs.forEach((leg, i) => {
    const y = 240 + i * 90;
    s.text(`leg-${i + 1}-id`, leg[0], 1832, y, 28, c.value, true);
    s.text(`leg-${i + 1}-name`, leg[1], 1920, y, 28, c.value);
    s.text(`leg-${i + 1}-eta`, `${leg[2]} · ETA ${leg[3]}`, 1920, y + 40, 18, c.caption);
  });
  s.text('route-note', 'Tide +1.2 m at Saltmere, falling', 1832, 640, 16, c.caption);
  s.text('route-fine-print', 'Chart datum LAT · soundings in metres · check notices before departure', 1832, 700, 12, c.fine);
  // Alarm chip at the lower left and engine figures.
  s.rect(40, 1180, 640, 100, c.alarm, 14);
  s.text('alarm', '⚠ Bilge pump 2 running 4 min', 72, 1212, 32, c.alarmText, true);
  s.rect(40, 500, 1160, 200, c.panel, 16);
  s.text('engine-caption', 'ENGINES', 72, 530, 22, c.caption, true);
  s.text('engine-port', 'Port 1420 rpm · 78 °C', 72, 580, 30, c.value);
  s.text('engine-stbd', 'Stbd 1415 rpm · 79 °C', 72, 630, 30, c.value);
  s.text('engine-fuel', 'Fuel 61 % · 212 L/h', 640, 580, 30, c.value);
  s.text('status-bar', 'AIS OK · GPS 2 OK · Gyro OK · Autopilot standby · Log 11.2 kn', 40, 1390, 14, c.caption);
  if (banner) {
    // A full-white notification banner across the dark console: the stray-light case.
    s.rect(700, 1060, 1160, 120, '#ffffff', 12);
    s.text('banner', 'Drill at 15:00 — muster at station B', 760, 1100, 40, '#101010', true);
  }
  await s.save();
}

/** Headset picking assistant: one eye buffer of the headset-wide preset (1600×1600, 100°). */
async function pickerHeadset(): Promise<void> {
  const s = new Scene('picker-headset', 1600, 1600);
  const g = s.g;
  // A dim warehouse aisle seen through the headset: a vertical gradient with shelf bands.
  const bg = g.createLinearGradient(0, 0, 0, 1600);
  bg.addColorStop(0, '#3a3f47');
  bg.addColorStop(1, '#22262c');
  g.fillStyle = bg;
  g.fillRect(0, 0, 1600, 1600);
  g.fillStyle = '#4b525c';
  for (let y = 180; y < 1600; y += 260) g.fillRect(0, y, 1600, 34);
  // Centre card: aisle, bin, quantity.
  s.rect(560, 600, 480, 400, 'rgba(12,18,28,0.92)', 24);
  s.text('aisle', 'AISLE 14', 620, 640, 56, '#ffffff', true);
  s.text('bin', 'BIN C-07', 620, 730, 56, '#ffd166', true);
  s.text('qty', 'QTY 6', 620, 820, 56, '#7ae582', true);
  s.text('item', 'Cable ties 300 mm, black', 620, 920, 22, '#c9d1dc');
  // Status chips toward the edges.
  s.rect(80, 80, 300, 64, 'rgba(12,18,28,0.85)', 32);
  s.text('chip-battery', 'Battery 64 %', 112, 100, 24, '#ffffff', true);
  s.rect(1220, 80, 300, 64, 'rgba(12,18,28,0.85)', 32);
  s.text('chip-order', 'Order 3 of 9', 1252, 100, 24, '#ffffff', true);
  s.rect(1250, 1430, 270, 80, 'rgba(12,18,28,0.85)', 40);
  s.text('timer', '02:41', 1300, 1450, 40, '#ffffff', true);
  s.rect(1080, 700, 300, 56, 'rgba(30,90,160,0.95)', 28);
  s.text('chip-notification', 'New pick added', 1108, 716, 22, '#ffffff', true);
  s.text('hint', 'Say "next" to confirm', 660, 1060, 18, '#9aa6b5');
  await s.save();
}

/**
 * Calibration chart for the desktop-27in preset (2560×1440 at 700 mm, 52.3 px/° at the centre):
 * gratings and letters at stated angular sizes. Gaze at the centre.
 */
async function calibrationChart(): Promise<void> {
  const s = new Scene('calibration-chart', 2560, 1440);
  const g = s.g;
  // Background at linear 0.5 (sRGB 188), the mean of a black-and-white grating, so a grating that
  // the viewer cannot resolve fades into the background rather than into a different grey.
  s.rect(0, 0, 2560, 1440, '#bcbcbc');
  g.strokeStyle = '#d00000';
  g.lineWidth = 2;
  g.beginPath();
  g.moveTo(1268, 720);
  g.lineTo(1292, 720);
  g.moveTo(1280, 708);
  g.lineTo(1280, 732);
  g.stroke();
  // Black-and-white square-wave gratings; periods in px.
  const grating = (x: number, y: number, w: number, h: number, periodPx: number, id: string, caption: string): void => {
    for (let xx = 0; xx < w; xx++) {
      g.fillStyle = Math.floor(xx / (periodPx / 2)) % 2 === 0 ? '#ffffff' : '#000000';
      g.fillRect(x + xx, y, 1, h);
    }
    s.text(id, caption, x, y + h + 8, 18, '#111111');
  };
  // Centre: 2 px period (26 cpd), 4 px (13 cpd), 8 px (6.5 cpd).
  grating(1180, 560, 64, 120, 2, 'grating-c1', '26 cpd');
  grating(1280, 560, 64, 120, 4, 'grating-c2', '13 cpd');
  grating(1380, 560, 64, 120, 8, 'grating-c3', '6.5 cpd');
  // About 10° right of centre (≈ 525 px): finer and coarser than the local sampling limit (≈ 8 cpd).
  grating(1760, 560, 120, 120, 4, 'grating-10deg-fine', '13 cpd at 10°');
  grating(1920, 560, 120, 120, 20, 'grating-10deg-coarse', '2.6 cpd at 10°');
  // Letter rows at the centre: capital heights in arcmin (1.147′ per px at the centre).
  const arcminPerPx = 1.1466;
  let y = 760;
  for (const arcmin of [5, 10, 20, 40]) {
    const capPx = arcmin / arcminPerPx;
    const sizePx = capPx / 0.698;
    s.text(`letters-${arcmin}`, 'HOVZ KDNR', 1120, y, sizePx, '#000000', true);
    s.text(`letters-${arcmin}-caption`, `${arcmin}′`, 1000, y, 18, '#111111');
    y += capPx + 40;
  }
  // Letters about 10° right of the gaze, where the smallest legible capital is about 19′.
  y = 760;
  for (const arcmin of [10, 20, 40]) {
    const capPx = arcmin / arcminPerPx;
    s.text(`letters-10deg-${arcmin}`, 'HOVZ', 1760, y, capPx / 0.698, '#000000', true);
    s.text(`letters-10deg-${arcmin}-caption`, `${arcmin}′ at 10°`, 1640, y, 18, '#111111');
    y += capPx + 40;
  }
  s.text('chart-title', 'Calibration chart · desktop-27in preset · gaze at the centre', 40, 40, 28, '#111111', true);
  await s.save();
}

await ferryConsole('ferry-console', DAY);
await ferryConsole('ferry-console-night', NIGHT);
await ferryConsole('ferry-console-banner', NIGHT, true);
await pickerHeadset();
await calibrationChart();
process.stderr.write('sample scenes written\n');
