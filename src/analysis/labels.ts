/**
 * Legibility verdicts for the text labels of a frame: is each label big enough where it sits, and are
 * its letters far enough apart not to crowd each other? Size uses the smallest-letter map; spacing
 * uses the critical spacing of crowding, Song, Levi & Pelli (2014), J Vision 14(5):3, Eq. 14:
 * 0.3·(φ + 0.45) deg at eccentricity φ.
 */
import type { LetterLimit } from './letter-size.js';
import { READING_RESERVE } from './letter-size.js';

export interface Label {
  id: string;
  text: string;
  /** [x, y, width, height] in frame pixels. */
  boxPx: [number, number, number, number];
  /** Capital-letter height, frame px. */
  letterHeightPx: number;
  /** Gap between letters, frame px (informational; spacing uses the mean advance from the box). */
  letterSpacingPx?: number;
}

export type Verdict = 'readable' | 'legible' | 'not legible';

/** The judgement of a label seen from one place in the visual field. */
export interface Judgement {
  verdict: Verdict;
  /** What limits the label: its size (and what sets the size limit there) or its spacing. */
  limitedBy: 'spacing' | 'blind spot' | `size (${LetterLimit})`;
  /** Eccentricity used, deg: the box centre's from the gaze, or 0 when the label is looked at. */
  eccentricityDeg: number;
  /** Smallest legible capital over the box, frame px; null where part of the box is in the blind spot. */
  smallestLetterPx: number | null;
  /** letterHeightPx / smallestLetterPx: 1 is the threshold, 2 is enough for fluent reading. */
  sizeMargin: number;
  /** Critical spacing of crowding, arcmin (Song, Levi & Pelli 2014, Eq. 14). */
  criticalSpacingArcmin: number;
  /** Letter advance / critical spacing: below 1 the letters crowd each other; null for one character. */
  spacingMargin: number | null;
}

export interface LabelVerdict {
  id: string;
  text: string;
  boxPx: [number, number, number, number];
  letterHeightPx: number;
  letterHeightArcmin: number;
  /** Mean letter advance (box width / characters), arcmin. */
  letterAdvanceArcmin: number;
  /** Seen from the current gaze, without moving the eyes. */
  fromGaze: Judgement;
  /** When the viewer looks straight at the label's centre. */
  whenFixated: Judgement;
}

export interface LabelMaps {
  width: number;
  height: number;
  smallestLetterPx: Float32Array;
  eccentricityDeg: Float32Array;
  arcminPerPx: Float32Array;
  /** What limits the letter size at a pixel. */
  limitAt: (index: number) => LetterLimit;
  /** Smallest legible letter at the centre of gaze for a pixel of the given angular size. */
  fixated: (arcminPerPx: number) => { px: number; limitedBy: LetterLimit };
}

/** Critical spacing of crowding at eccentricity φ, deg (Song, Levi & Pelli 2014, Eq. 14). */
export function criticalSpacingDeg(eccentricityDeg: number): number {
  return 0.3 * (eccentricityDeg + 0.45);
}

function judge(label: Label, smallestLetterPx: number, limit: LetterLimit, eccentricityDeg: number, letterAdvanceArcmin: number, characters: number): Judgement {
  const criticalSpacingArcmin = criticalSpacingDeg(eccentricityDeg) * 60;
  // An infinite smallest letter is the blind spot: no size is legible there.
  const sizeMargin = Number.isFinite(smallestLetterPx) ? label.letterHeightPx / smallestLetterPx : 0;
  // A single character cannot crowd itself.
  const spacingMargin = characters > 1 ? letterAdvanceArcmin / criticalSpacingArcmin : null;
  const legible = sizeMargin >= 1 && (spacingMargin === null || spacingMargin >= 1);
  return {
    verdict: legible && sizeMargin >= READING_RESERVE ? 'readable' : legible ? 'legible' : 'not legible',
    limitedBy: limit === 'blind spot' ? 'blind spot' : spacingMargin !== null && spacingMargin < sizeMargin ? 'spacing' : `size (${limit})`,
    eccentricityDeg, smallestLetterPx: Number.isFinite(smallestLetterPx) ? smallestLetterPx : null, sizeMargin, criticalSpacingArcmin, spacingMargin,
  };
}

export function judgeLabel(label: Label, maps: LabelMaps): LabelVerdict {
  const [bx, by, bw, bh] = label.boxPx;
  const x0 = Math.max(0, Math.floor(bx));
  const y0 = Math.max(0, Math.floor(by));
  const x1 = Math.min(maps.width, Math.ceil(bx + bw));
  const y1 = Math.min(maps.height, Math.ceil(by + bh));
  let worst = 0;
  let worstIndex = y0 * maps.width + x0;
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) {
      const v = maps.smallestLetterPx[y * maps.width + x];
      if (v > worst) {
        worst = v;
        worstIndex = y * maps.width + x;
      }
    }
  }
  const cx = Math.min(maps.width - 1, Math.max(0, Math.floor(bx + bw / 2)));
  const cy = Math.min(maps.height - 1, Math.max(0, Math.floor(by + bh / 2)));
  const centre = cy * maps.width + cx;
  const arcminPerPx = maps.arcminPerPx[centre];
  const characters = Math.max(1, [...label.text].length);
  const letterAdvanceArcmin = (bw / characters) * arcminPerPx;
  const fixated = maps.fixated(arcminPerPx);
  return {
    id: label.id, text: label.text, boxPx: label.boxPx, letterHeightPx: label.letterHeightPx,
    letterHeightArcmin: label.letterHeightPx * arcminPerPx, letterAdvanceArcmin,
    fromGaze: judge(label, worst, maps.limitAt(worstIndex), maps.eccentricityDeg[centre], letterAdvanceArcmin, characters),
    whenFixated: judge(label, fixated.px, fixated.limitedBy, 0, letterAdvanceArcmin, characters),
  };
}
