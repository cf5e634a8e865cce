/** Drawing surface for maps and compare images: @napi-rs/canvas with a bundled font, so text renders the same on every machine. */
import { createRequire } from 'node:module';
import { createCanvas, GlobalFonts, type Canvas, type SKRSContext2D } from '@napi-rs/canvas';

/** Family name under which the bundled IBM Plex Sans (SIL Open Font License) is registered. */
export const FONT_FAMILY = 'EyeproofSans';
let fontsReady = false;

function ensureFonts(): void {
  if (fontsReady) return;
  const require = createRequire(import.meta.url);
  for (const weight of ['400', '600']) {
    GlobalFonts.registerFromPath(require.resolve(`@fontsource/ibm-plex-sans/files/ibm-plex-sans-latin-${weight}-normal.woff2`), FONT_FAMILY);
  }
  fontsReady = true;
}

export function newCanvas(width: number, height: number): { canvas: Canvas; g: SKRSContext2D } {
  ensureFonts();
  const canvas = createCanvas(width, height);
  return { canvas, g: canvas.getContext('2d') };
}

export function font(sizePx: number, bold = false): string {
  return `${bold ? 600 : 400} ${Math.round(sizePx)}px ${FONT_FAMILY}`;
}

/** Interleaved RGBA bytes of the whole canvas. */
export function canvasRgba(canvas: Canvas): Uint8ClampedArray {
  return canvas.getContext('2d').getImageData(0, 0, canvas.width, canvas.height).data;
}

/** Puts RGBA bytes of the given size on the canvas at (x, y). */
export function putRgba(g: SKRSContext2D, rgba: Uint8ClampedArray, width: number, height: number, x: number, y: number): void {
  const data = g.createImageData(width, height);
  data.data.set(rgba);
  g.putImageData(data, x, y);
}

/** Text with a contrasting halo so it stays readable over any image. */
export function haloText(g: SKRSContext2D, text: string, x: number, y: number, sizePx: number, colour = '#ffffff', halo = 'rgba(0,0,0,0.85)'): void {
  g.font = font(sizePx, true);
  g.lineJoin = 'round';
  g.lineWidth = Math.max(2, sizePx / 5);
  g.strokeStyle = halo;
  g.strokeText(text, x, y);
  g.fillStyle = colour;
  g.fillText(text, x, y);
}

/** Gaze marker: a ring with a cross, in black and white so it shows on any background. */
export function drawGazeMarker(g: SKRSContext2D, x: number, y: number, sizePx: number): void {
  for (const [colour, width] of [['#000000', sizePx / 6 + 2], ['#ffffff', sizePx / 6]] as const) {
    g.strokeStyle = colour;
    g.lineWidth = width;
    g.beginPath();
    g.arc(x, y, sizePx, 0, 2 * Math.PI);
    g.moveTo(x - 2 * sizePx, y);
    g.lineTo(x - sizePx * 0.5, y);
    g.moveTo(x + sizePx * 0.5, y);
    g.lineTo(x + 2 * sizePx, y);
    g.moveTo(x, y - 2 * sizePx);
    g.lineTo(x, y - sizePx * 0.5);
    g.moveTo(x, y + sizePx * 0.5);
    g.lineTo(x, y + 2 * sizePx);
    g.stroke();
  }
}

/**
 * The header band of the side-by-side pictures: titles (each at its x) in bold, the caption, and the
 * caution line, in the pictures' shared type sizes.
 */
export function drawPictureHeader(g: SKRSContext2D, text: number, titles: readonly [string, number][], caption: string, caution: string): void {
  g.fillStyle = '#f0f0f0';
  g.font = font(text * 1.05, true);
  for (const [title, x] of titles) g.fillText(title, x, text * 1.5);
  g.font = font(text * 0.9);
  g.fillStyle = '#cfd4dc';
  g.fillText(caption, text * 0.6, text * 2.8);
  g.fillStyle = '#9aa3b0';
  g.font = font(text * 0.75);
  g.fillText(caution, text * 0.6, text * 3.9);
}

/** Fills text wrapped at word breaks to a width, line by line from (x, y). */
export function wrapText(g: SKRSContext2D, text: string, x: number, y: number, maxWidth: number, lineHeight: number): void {
  let line = '';
  for (const word of text.split(' ')) {
    const next = line ? `${line} ${word}` : word;
    if (g.measureText(next).width > maxWidth && line) {
      g.fillText(line, x, y);
      line = word;
      y += lineHeight;
    } else line = next;
  }
  if (line) g.fillText(line, x, y);
}
