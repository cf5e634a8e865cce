/**
 * Text contrast of a label: the luminances of its text and background, split from the frame, and
 * the contrast those reach the retina with after the eye's optics and stray light.
 *
 * The requirement is WCAG 2.2 Success Criterion 1.4.3 (Contrast, Minimum): a contrast ratio
 * (L1 + 0.05) / (L2 + 0.05) of relative luminances of at least 4.5:1 for text, 3:1 for large text
 * (18 pt, i.e. 24 CSS px, whose reference pixel subtends 0.0213°). We apply the ratio twice: to the
 * frame as drawn (conformance, as the standard defines it) and to the luminances reaching the retina
 * (what this viewer gets), with luminances relative to the display's white.
 */

/** WCAG 2.2 SC 1.4.3 minimum contrast ratio for text. */
export const WCAG_TEXT_RATIO = 4.5;
/** WCAG 2.2 SC 1.4.3 minimum contrast ratio for large text. */
export const WCAG_LARGE_TEXT_RATIO = 3;
/** The CSS reference pixel subtends 0.0213° (CSS Values and Units Level 3), in arcmin. */
export const CSS_REFERENCE_PIXEL_ARCMIN = 0.0213 * 60;
/** Capital height per font size of common sans-serif faces (common practice: about 0.7 em). */
export const CAP_HEIGHT_PER_EM = 0.7;
/** Large text in WCAG is 18 pt = 24 CSS px of font size; as a capital height, arcmin. */
export const LARGE_TEXT_CAP_ARCMIN = 24 * CSS_REFERENCE_PIXEL_ARCMIN * CAP_HEIGHT_PER_EM;

/** WCAG contrast ratio of two relative luminances (0 black to 1 white). */
export function contrastRatio(a: number, b: number): number {
  return (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05);
}

/** The ratio text of a given capital height needs (WCAG 2.2 SC 1.4.3). */
export function requiredRatio(capHeightArcmin: number): number {
  return capHeightArcmin >= LARGE_TEXT_CAP_ARCMIN ? WCAG_LARGE_TEXT_RATIO : WCAG_TEXT_RATIO;
}

export interface TextClasses {
  /** Mean relative luminance (0–1 of the frame's range) of the text pixels and of the background. */
  text: number;
  background: number;
  /** Share of the box's pixels that are text. */
  textShare: number;
}

/**
 * Splits a box of a luminance plane into text and background by Otsu's threshold (Otsu 1979): the
 * split that maximises the between-class variance. Text is the smaller class. A box of one
 * luminance has no text contrast (text = background).
 */
export function textClasses(luminance: Float32Array, width: number, box: readonly [number, number, number, number]): TextClasses {
  const [bx, by, bw, bh] = box;
  const height = luminance.length / width;
  const x0 = Math.max(0, Math.floor(bx));
  const y0 = Math.max(0, Math.floor(by));
  const x1 = Math.min(width, Math.ceil(bx + bw));
  const y1 = Math.min(height, Math.ceil(by + bh));
  const BINS = 256;
  const hist = new Float64Array(BINS);
  const sums = new Float64Array(BINS);
  let lo = Infinity;
  let hi = -Infinity;
  for (let y = y0; y < y1; y++) for (let x = x0; x < x1; x++) {
    const v = luminance[y * width + x];
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (!(hi > lo)) return { text: Number.isFinite(lo) ? lo : 0, background: Number.isFinite(lo) ? lo : 0, textShare: 0 };
  const bin = (v: number): number => Math.min(BINS - 1, Math.floor(((v - lo) / (hi - lo)) * BINS));
  for (let y = y0; y < y1; y++) for (let x = x0; x < x1; x++) {
    const v = luminance[y * width + x];
    hist[bin(v)]++;
    sums[bin(v)] += v;
  }
  let total = 0;
  let totalSum = 0;
  for (let i = 0; i < BINS; i++) {
    total += hist[i];
    totalSum += sums[i];
  }
  let best = -1;
  let split = 0;
  let n0 = 0;
  let s0 = 0;
  for (let i = 0; i < BINS - 1; i++) {
    n0 += hist[i];
    s0 += sums[i];
    const n1 = total - n0;
    if (n0 === 0 || n1 === 0) continue;
    const d = s0 / n0 - (totalSum - s0) / n1;
    const between = n0 * n1 * d * d;
    if (between > best) {
      best = between;
      split = i;
    }
  }
  let nDark = 0;
  let sDark = 0;
  for (let i = 0; i <= split; i++) {
    nDark += hist[i];
    sDark += sums[i];
  }
  const dark = sDark / nDark;
  const light = (totalSum - sDark) / (total - nDark);
  const darkIsText = nDark <= total - nDark;
  return { text: darkIsText ? dark : light, background: darkIsText ? light : dark, textShare: (darkIsText ? nDark : total - nDark) / total };
}

export interface RetinalContrastInput {
  /** Text and background as relative luminance of the frame (0 = display black, 1 = display white). */
  classes: TextClasses;
  /** The eye's modulation transfer at the letters' stroke frequency (optics, off-axis loss). */
  strokeTransfer: number;
  /** Share of the light the eye keeps in the image's core (the rest is stray light). */
  coreFraction: number;
  /** Stray light at the label, relative to the display's white luminance. */
  veil: number;
  /** Display black relative to its white, cd/m² over cd/m². */
  blackShare: number;
}

/**
 * Contrast reaching the retina: the strokes' modulation around the background scaled by the optics'
 * transfer, the core dimmed by the share the eye scatters, and the veil added to both.
 */
export function retinalContrastRatio(input: RetinalContrastInput): number {
  const { classes, strokeTransfer, coreFraction, veil, blackShare } = input;
  const toWhite = (v: number): number => blackShare + v * (1 - blackShare);
  const bg = toWhite(classes.background);
  const text = bg + (toWhite(classes.text) - bg) * Math.max(0, Math.min(1, strokeTransfer));
  return contrastRatio(coreFraction * text + veil, coreFraction * bg + veil);
}
