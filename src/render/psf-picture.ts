/**
 * psf.png: the eye's point-spread function for each colour channel at the same angular scale, with
 * a scale bar in arcmin, so a reviewer can see the blur's size, shape and colour fringes.
 */
import { encircledEnergyDiameterArcmin, type PsfGrid } from '../optics/pupil-psf.js';
import type { EyeOpticsFigures } from '../optics/eye-optics.js';
import { canvasRgba, font, newCanvas } from './canvas.js';

const PANEL_PX = 320;
const CHANNELS = [
  { name: 'red', rgb: [255, 90, 80] },
  { name: 'green', rgb: [90, 230, 110] },
  { name: 'blue', rgb: [110, 150, 255] },
] as const;

export function renderPsfPicture(psfs: readonly Float64Array[], grid: PsfGrid, figures: EyeOpticsFigures, caption: string): { rgba: Uint8ClampedArray; width: number; height: number } {
  const sampleArcmin = figures.psfSampleArcmin;
  // A common window: twice the widest channel's 80 % energy diameter, at least 4′, at most the grid.
  const widest = Math.max(...psfs.map((p) => encircledEnergyDiameterArcmin(p, grid, 0.8)));
  const halfArcmin = Math.min((grid.size / 2 - 1) * sampleArcmin, Math.max(2, widest));
  const text = 15;
  const header = 70;
  const footer = 64;
  const { canvas, g } = newCanvas(CHANNELS.length * (PANEL_PX + 16) + 16, PANEL_PX + header + footer);
  g.fillStyle = '#0f1115';
  g.fillRect(0, 0, canvas.width, canvas.height);
  g.fillStyle = '#f0f0f0';
  g.font = font(text * 1.1, true);
  g.fillText('Point-spread function of this eye, per display primary (√ intensity, each panel scaled to its peak)', 16, 24);
  g.font = font(text * 0.85);
  g.fillStyle = '#c0c6cf';
  g.fillText(caption, 16, 46);
  const n = grid.size;
  psfs.forEach((psf, c) => {
    const x0 = 16 + c * (PANEL_PX + 16);
    const image = g.createImageData(PANEL_PX, PANEL_PX);
    const peak = psf.reduce((a, b) => Math.max(a, b), 0);
    for (let py = 0; py < PANEL_PX; py++) {
      for (let px = 0; px < PANEL_PX; px++) {
        // Panel pixel → PSF sample (nearest); y up in the PSF, down on screen.
        const ax = ((px + 0.5) / PANEL_PX - 0.5) * 2 * halfArcmin;
        const ay = (0.5 - (py + 0.5) / PANEL_PX) * 2 * halfArcmin;
        const sx = Math.round(n / 2 + ax / sampleArcmin);
        const sy = Math.round(n / 2 + ay / sampleArcmin);
        const v = sx >= 0 && sy >= 0 && sx < n && sy < n ? Math.sqrt(psf[sy * n + sx] / peak) : 0;
        const o = (py * PANEL_PX + px) * 4;
        image.data[o] = CHANNELS[c].rgb[0] * v;
        image.data[o + 1] = CHANNELS[c].rgb[1] * v;
        image.data[o + 2] = CHANNELS[c].rgb[2] * v;
        image.data[o + 3] = 255;
      }
    }
    g.putImageData(image, x0, header);
    g.strokeStyle = '#3a3f47';
    g.strokeRect(x0 + 0.5, header + 0.5, PANEL_PX - 1, PANEL_PX - 1);
    const defocus = [figures.defocusByChannelD.red, figures.defocusByChannelD.green, figures.defocusByChannelD.blue][c];
    g.fillStyle = '#e8e8e8';
    g.font = font(text, true);
    g.fillText(`${CHANNELS[c].name}: defocus ${defocus >= 0 ? '+' : ''}${defocus.toFixed(2)} D`, x0, header + PANEL_PX + 22);
  });
  // Scale bar: a round number of arcmin near a quarter of the panel.
  const target = halfArcmin / 2;
  const bar = [0.5, 1, 2, 5, 10, 20, 30, 60].reduce((best, v) => (Math.abs(v - target) < Math.abs(best - target) ? v : best));
  const barPx = (bar / (2 * halfArcmin)) * PANEL_PX;
  g.fillStyle = '#ffffff';
  g.fillRect(16, header + PANEL_PX + 36, barPx, 4);
  g.font = font(text * 0.9);
  g.fillText(`${bar}′  (panels are ${(2 * halfArcmin).toFixed(1)}′ wide)`, 24 + barPx, header + PANEL_PX + 44);
  return { rgba: canvasRgba(canvas), width: canvas.width, height: canvas.height };
}
