/**
 * Legibility verdicts for the text labels of a frame. A label is judged by its role:
 * - `glance`: read without moving the eyes from the gaze (a readout checked from the corner of the eye);
 * - `look` (the default): read when the viewer looks straight at it;
 * - `decorative`: not judged.
 * Four limits, each with its margin and source:
 * - size: capital height over the smallest legible letter at the label's farthest point from the gaze
 *   (letter-size.ts); fluent reading needs READING_RESERVE× (Whittaker & Lovie-Kitchin 1993);
 * - spacing: the mean letter advance over the critical spacing of crowding, 0.3·(φ + 0.45) deg at
 *   eccentricity φ (Song, Levi & Pelli 2014, J Vision 14(5):3, Eq. 14). Crowding is not drawn in the
 *   percept: letters that are each resolved can still not be read when crowded;
 * - contrast: the WCAG 2.2 contrast ratio this viewer effectively gets, over 4.5:1 (3:1 for large
 *   text) (contrast.ts): the frame's ratio, scaled by the ratio reaching this viewer's retina (the
 *   optics at the letter rule's coarse frequency, the viewer's stray light from the whole field) over the ratio
 *   reaching the reference viewer's retina without stray light. The standard's thresholds already
 *   allow for ordinary eyes' optics (its 4.5:1 was set for viewers with 20/40 acuity), so only the
 *   loss beyond the reference eye, and all local glare (a bright banner beside dim text), count;
 * - blind spot: part of the box falls in it (one eye only).
 * A label passes when it is readable: every limit met with the size reserve. The fix says what
 * would make it pass: the capital height, the letter advance, the contrast, or (glance labels) how
 * far toward the gaze it would have to move.
 */
import { contrastRatio, requiredRatio, retinalContrastRatio, textClasses, type TextClasses } from './contrast.js';
import type { AudienceShare } from './audience.js';
import { OPTICAL_CYCLES_PER_LETTER, READING_RESERVE, type LetterLimit } from './letter-size.js';

export const LABEL_ROLES = ['glance', 'look', 'decorative'] as const;
export type LabelRole = (typeof LABEL_ROLES)[number];

export interface Label {
  id: string;
  text: string;
  /** [x, y, width, height] in frame pixels. */
  boxPx: [number, number, number, number];
  /** Capital-letter height, frame px. */
  letterHeightPx: number;
  /** Gap between letters, frame px (informational; spacing uses the mean advance from the box). */
  letterSpacingPx?: number;
  /** How the label is read (default `look`). */
  role?: LabelRole;
  /** Number of characters, when the text is not given (detected runs); default: the text's length. */
  characters?: number;
}

export type Verdict = 'readable' | 'legible' | 'not legible' | 'not judged';
export type LimitName = 'size' | 'spacing' | 'contrast' | 'blind spot';

export const LIMIT_SOURCES: Record<LimitName, string> = {
  size: `smallest legible letter of this eye (letter-size.ts: Elliott, Yang & Whitaker 1995; Blendowske 2015; Song, Levi & Pelli 2014 Eq. 13), ${READING_RESERVE}× for fluent reading (Whittaker & Lovie-Kitchin 1993)`,
  spacing: 'critical spacing of crowding 0.3·(φ + 0.45)° (Song, Levi & Pelli 2014, Eq. 14)',
  contrast: 'WCAG 2.2 SC 1.4.3 contrast ratio, 4.5:1 (3:1 for text of 18 pt and larger), of the frame, scaled by what this viewer loses beyond the reference eye and by stray light',
  'blind spot': 'optic disc, 15.5° temporal, 5.5° × 7.5° (common practice)',
};

/** One limit of a judgement: its margin (1 = just passes) and what it needs. */
export interface Limit {
  name: LimitName;
  /** Quantity over what is needed; ≥ 1 passes. For size, the need includes the reading reserve. */
  margin: number;
  passes: boolean;
}

/** The judgement of a label seen from one place in the visual field. */
export interface Judgement {
  verdict: Exclude<Verdict, 'not judged'>;
  /** The tightest limit (the one to fix first, or the nearest to failing). */
  limitedBy: LimitName;
  /** What sets the smallest letter here (retina, optics, defocus, …). */
  sizeLimitedBy: LetterLimit;
  /** Eccentricity of the label's farthest point from the gaze, deg (0 when looked at). */
  eccentricityDeg: number;
  /** Smallest legible capital there, frame px; null in the blind spot. */
  smallestLetterPx: number | null;
  /** letterHeightPx / smallestLetterPx: 1 is the threshold, READING_RESERVE is enough for fluent reading. */
  sizeMargin: number;
  /** Critical spacing of crowding there, arcmin (Song, Levi & Pelli 2014, Eq. 14). */
  criticalSpacingArcmin: number;
  /** Letter advance / critical spacing: below 1 the letters crowd each other; null for one character. */
  spacingMargin: number | null;
  /** WCAG contrast ratio of the text as it reaches this viewer's retina. */
  retinalContrastRatio: number;
  /** The ratio this viewer effectively gets: the frame's, scaled by the loss beyond the reference eye (see the file's comment). */
  effectiveContrastRatio: number;
  limits: Limit[];
}

/** A length in the units designers use. */
export interface DesignLength {
  /** Frame pixels. */
  px: number;
  /** Design units: frame px / frame.pixelRatio (pt on iOS, dp on Android at their base density, CSS px). */
  designPx: number;
  /** On a screen: millimetres and typographic points (1/72 in); absent on a headset. */
  mm?: number;
  pt?: number;
  arcmin: number;
}

export interface LabelFix {
  /** Capital height that would pass where the label is judged; absent when size passes. */
  capHeight?: DesignLength;
  /** Letter advance (box width / characters) that would end crowding, and the space to add between letters. */
  letterAdvance?: DesignLength & { addPerGapPx: number };
  /** Contrast ratio (WCAG) the frame's colours would need for the retinal ratio to pass. */
  contrastRatio?: number;
  /** Glance labels: the farthest eccentricity (of the label's far edge) at which it passes as drawn, deg; null when nowhere. */
  passesWithinDeg?: number | null;
  /** Glance labels: how far toward the gaze it would have to move, deg. */
  moveTowardGazeDeg?: number;
  /** The fix in words. */
  summary: string;
}

export interface LabelVerdict {
  id: string;
  text: string;
  role: LabelRole;
  boxPx: [number, number, number, number];
  letterHeightPx: number;
  letterHeightArcmin: number;
  /** Mean letter advance (box width / characters), arcmin. */
  letterAdvanceArcmin: number;
  /** Text and background as drawn: relative luminances and the WCAG ratio of the frame itself. */
  contrast: { text: number; background: number; frameRatio: number; requiredRatio: number };
  /** The verdict by the label's role: fromGaze for glance, whenFixated for look. */
  verdict: Verdict;
  passes: boolean | null;
  /** Seen from the current gaze, without moving the eyes. */
  fromGaze: Judgement;
  /** When the viewer looks straight at the label's centre. */
  whenFixated: Judgement;
  /** What would make it pass; absent when it passes or is decorative. */
  fix?: LabelFix;
  /** Share of the audience whose eyes read it at its size where it is judged, crowding and blind spot counted (audience.ts); absent for decorative labels. */
  audience?: AudienceShare;
  /** Glance labels: from how far away (the gaze from the label's centre, deg, per direction) it is still read. */
  reach?: Reach;
}

/** The gaze positions from which a glance label passes: a radius around its centre per direction. */
export interface Reach {
  /** Field directions around the label's centre, deg (0 right, 90 up), evenly spaced. */
  directionsDeg: number[];
  /** Largest distance of the gaze from the label's centre in each direction, deg (0: only on the label). */
  radiusDeg: number[];
  /** The outline in frame px (filled in by the pipeline, which knows the view geometry). */
  outlinePx?: [number, number][];
}

/** What the label judge needs to know about the frame, the viewer and the gaze. */
export interface LabelMaps {
  width: number;
  height: number;
  eccentricityDeg: Float32Array;
  meridianDeg: Float32Array;
  arcminPerPx: Float32Array;
  /** 1 where the retina sees, 0 in the blind spot (one eye only). */
  seen?: Float32Array;
  /** Smallest legible capital at a point of the field for a pixel of the given size (blind spot aside). */
  letterAt: (eccentricityDeg: number, meridianDeg: number, arcminPerPx: number) => { px: number; limitedBy: LetterLimit };
  /** Relative luminance of the frame (linear, 0–1 of display white above black). */
  luminance: Float32Array;
  /** The optics' modulation transfer at a frequency and eccentricity (stray light aside). */
  transferAt: (fCpd: number, eccentricityDeg: number) => number;
  /** The reference viewer's, at the same place. */
  referenceTransferAt: (fCpd: number, eccentricityDeg: number) => number;
  /** The viewer's stray light at a frame pixel, relative to display white. */
  veilAt: (xPx: number, yPx: number) => number;
  /** Display black over white. */
  blackShare: number;
  /** Share of light kept in the image's core. */
  coreFraction: number;
  units: DesignUnits;
  /** Share of the audience (audience.ts) that reads a capital of `letterPx` at a field point, size only. */
  audienceAt?: (eccentricityDeg: number, meridianDeg: number, arcminPerPx: number, letterPx: number) => AudienceShare;
}

export interface DesignUnits {
  /** Frame pixels per design unit (frame.pixelRatio). */
  pixelRatio: number;
  /** Millimetres per frame pixel on a screen (absent on a headset). */
  mmPerFramePx?: number;
}

export const MM_PER_POINT = 25.4 / 72;

export function designLength(px: number, arcminPerPx: number, units: DesignUnits): DesignLength {
  const mm = units.mmPerFramePx !== undefined ? px * units.mmPerFramePx : undefined;
  return { px, designPx: px / units.pixelRatio, ...(mm !== undefined ? { mm, pt: mm / MM_PER_POINT } : {}), arcmin: px * arcminPerPx };
}

/** The judgement a label's verdict rests on: from the gaze for glance labels, when looked at otherwise. */
export function countedJudgement(v: Pick<LabelVerdict, 'role' | 'fromGaze' | 'whenFixated'>): Judgement {
  return v.role === 'glance' ? v.fromGaze : v.whenFixated;
}

/** Critical spacing of crowding at eccentricity φ, deg (Song, Levi & Pelli 2014, Eq. 14). */
export function criticalSpacingDeg(eccentricityDeg: number): number {
  return 0.3 * (eccentricityDeg + 0.45);
}

/** Largest eccentricity at which a letter advance escapes crowding, deg (inverse of Eq. 14); −1 when none. */
export function crowdingFreeWithinDeg(letterAdvanceArcmin: number): number {
  return Math.max(-1, letterAdvanceArcmin / 60 / 0.3 - 0.45);
}

interface Place {
  eccentricityDeg: number;
  meridianDeg: number;
  arcminPerPx: number;
  inBlindSpot: boolean;
}

interface LabelGeometry {
  characters: number;
  letterAdvanceArcmin: number;
  letterHeightArcmin: number;
  classes: TextClasses;
  veil: number;
}

function judgeAt(label: Label, g: LabelGeometry, place: Place, maps: LabelMaps): Judgement {
  const letter = maps.letterAt(place.eccentricityDeg, place.meridianDeg, place.arcminPerPx);
  const criticalSpacingArcmin = criticalSpacingDeg(place.eccentricityDeg) * 60;
  const sizeMargin = place.inBlindSpot ? 0 : label.letterHeightPx / letter.px;
  // A single character cannot crowd itself.
  const spacingMargin = g.characters > 1 ? g.letterAdvanceArcmin / criticalSpacingArcmin : null;
  // Contrast is judged at the size the label would have once its size passes, so the two limits
  // name separate fixes: a letter too small for a blurred eye fails on size, not twice.
  const strokeArcmin = Math.max(g.letterHeightArcmin, place.inBlindSpot ? 0 : READING_RESERVE * letter.px * place.arcminPerPx);
  // Letters are told apart by their coarse structure: the transfer is taken at the letter rule's
  // OPTICAL_CYCLES_PER_LETTER (letter-size.ts), the frequency at which blur limits letters.
  const strokeCpd = (OPTICAL_CYCLES_PER_LETTER * 60) / strokeArcmin;
  const retinal = retinalContrastRatio({ classes: g.classes, strokeTransfer: maps.transferAt(strokeCpd, place.eccentricityDeg), coreFraction: maps.coreFraction, veil: g.veil, blackShare: maps.blackShare });
  const reference = retinalContrastRatio({ classes: g.classes, strokeTransfer: maps.referenceTransferAt(strokeCpd, place.eccentricityDeg), coreFraction: 1, veil: 0, blackShare: maps.blackShare });
  const effective = Math.max(1, (contrastRatio(g.classes.text, g.classes.background) * retinal) / reference);
  const required = requiredRatio(g.letterHeightArcmin);
  const limits: Limit[] = [
    { name: 'size', margin: sizeMargin / READING_RESERVE, passes: sizeMargin >= READING_RESERVE },
    ...(spacingMargin !== null ? [{ name: 'spacing' as const, margin: spacingMargin, passes: spacingMargin >= 1 }] : []),
    { name: 'contrast', margin: effective / required, passes: effective >= required },
    ...(place.inBlindSpot ? [{ name: 'blind spot' as const, margin: 0, passes: false }] : []),
  ];
  const tightest = limits.reduce((a, b) => (b.margin < a.margin ? b : a));
  // Legible: the letters can be made out (size at threshold, no crowding, not in the blind spot);
  // readable: every limit met, size with the reading reserve.
  const legible = !place.inBlindSpot && sizeMargin >= 1 && (spacingMargin === null || spacingMargin >= 1);
  return {
    verdict: legible && limits.every((l) => l.passes) ? 'readable' : legible ? 'legible' : 'not legible',
    limitedBy: tightest.name, sizeLimitedBy: place.inBlindSpot ? 'blind spot' : letter.limitedBy,
    eccentricityDeg: place.eccentricityDeg, smallestLetterPx: place.inBlindSpot ? null : letter.px, sizeMargin,
    criticalSpacingArcmin, spacingMargin, retinalContrastRatio: retinal, effectiveContrastRatio: effective, limits,
  };
}

/** Index of the box pixel farthest from the gaze, and whether any box pixel is in the blind spot. */
function farthestPoint(box: Label['boxPx'], maps: LabelMaps): { index: number; inBlindSpot: boolean } {
  const [bx, by, bw, bh] = box;
  const x0 = Math.max(0, Math.floor(bx));
  const y0 = Math.max(0, Math.floor(by));
  const x1 = Math.min(maps.width, Math.ceil(bx + bw));
  const y1 = Math.min(maps.height, Math.ceil(by + bh));
  let index = y0 * maps.width + x0;
  let inBlindSpot = false;
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) {
      const i = y * maps.width + x;
      if (maps.eccentricityDeg[i] > maps.eccentricityDeg[index]) index = i;
      if (maps.seen && maps.seen[i] < 0.5) inBlindSpot = true;
    }
  }
  return { index, inBlindSpot };
}

/** The largest eccentricity (same meridian and pixel size) at which the label passes, 0.05° steps; null if not even at 0. */
function passesWithinDeg(label: Label, g: LabelGeometry, place: Place, maps: LabelMaps): number | null {
  const passesAt = (e: number): boolean => judgeAt(label, g, { ...place, eccentricityDeg: e, inBlindSpot: false }, maps).limits.every((l) => l.passes);
  if (!passesAt(0)) return null;
  let lo = 0;
  let hi = 90;
  if (passesAt(hi)) return hi;
  // Passing falls off with eccentricity; bisection to 0.01°.
  while (hi - lo > 0.01) {
    const mid = (lo + hi) / 2;
    if (passesAt(mid)) lo = mid;
    else hi = mid;
  }
  return lo;
}

function fixFor(label: Label, g: LabelGeometry, judgement: Judgement, place: Place, maps: LabelMaps, role: LabelRole): LabelFix {
  const words: string[] = [];
  let move = '';
  const fix: LabelFix = { summary: '' };
  if (role === 'glance') {
    const within = passesWithinDeg(label, g, place, maps);
    fix.passesWithinDeg = within;
    if (within !== null) {
      fix.moveTowardGazeDeg = Math.max(0, judgement.eccentricityDeg - within);
      move = `move it ${fix.moveTowardGazeDeg.toFixed(1)}° toward the gaze (its far edge within ${within.toFixed(1)}° of it)`;
    } else {
      move = 'as drawn it would not pass even at the gaze';
    }
  }
  const size = judgement.limits.find((l) => l.name === 'size')!;
  if (!size.passes && judgement.smallestLetterPx !== null) {
    fix.capHeight = designLength(Math.ceil(READING_RESERVE * judgement.smallestLetterPx), place.arcminPerPx, maps.units);
    words.push(`capital height ${describeLength(fix.capHeight)} (now ${describeLength(designLength(label.letterHeightPx, place.arcminPerPx, maps.units))})`);
  }
  const spacing = judgement.limits.find((l) => l.name === 'spacing');
  if (spacing && !spacing.passes) {
    const neededPx = judgement.criticalSpacingArcmin / place.arcminPerPx;
    const nowPx = label.boxPx[2] / g.characters;
    fix.letterAdvance = { ...designLength(Math.ceil(neededPx), place.arcminPerPx, maps.units), addPerGapPx: Math.ceil(neededPx - nowPx) };
    const times = neededPx / nowPx;
    words.push(times > 2
      ? `letters ${times.toFixed(1)}× as far apart to escape crowding (${fix.letterAdvance.px} px centre to centre): fewer characters, or read it with a look rather than a glance`
      : `letters ${fix.letterAdvance.px} px apart centre to centre, ${fix.letterAdvance.addPerGapPx} px more space between letters (crowding)`);
  }
  const contrast = judgement.limits.find((l) => l.name === 'contrast')!;
  if (!contrast.passes) {
    fix.contrastRatio = Math.min(21, contrastRatio(g.classes.text, g.classes.background) / contrast.margin);
    words.push(`text contrast about ${fix.contrastRatio.toFixed(1)}:1 in the frame (now ${contrastRatio(g.classes.text, g.classes.background).toFixed(1)}:1, effectively ${judgement.effectiveContrastRatio.toFixed(1)}:1 for this viewer${fix.capHeight ? ' at the size above' : ''})`);
  }
  if (judgement.limits.some((l) => l.name === 'blind spot')) words.push('move it out of the blind spot');
  fix.summary = move ? `${move}${words.length ? `; or, where it is: ${words.join('; ')}` : ''}` : words.join('; ');
  return fix;
}

export function describeLength(l: DesignLength): string {
  const parts = [`${Math.round(l.px)} px`];
  if (l.designPx !== l.px) parts.push(`${round1(l.designPx)} design px`);
  if (l.pt !== undefined) parts.push(`${round1(l.pt)} pt`, `${round1(l.mm!)} mm`);
  parts.push(`${round1(l.arcmin)}′`);
  return parts.join(' = ');
}

const round1 = (v: number): string => (Math.round(v * 10) / 10).toString();

function geometryOf(label: Label, maps: LabelMaps): LabelGeometry & { arcminPerPx: number } {
  const [bx, by, bw, bh] = label.boxPx;
  const cx = Math.min(maps.width - 1, Math.max(0, Math.floor(bx + bw / 2)));
  const cy = Math.min(maps.height - 1, Math.max(0, Math.floor(by + bh / 2)));
  const arcminPerPx = maps.arcminPerPx[cy * maps.width + cx];
  const characters = Math.max(1, label.characters ?? [...label.text].length);
  const classes = textClasses(maps.luminance, maps.width, label.boxPx);
  return { characters, letterAdvanceArcmin: (bw / characters) * arcminPerPx, letterHeightArcmin: label.letterHeightPx * arcminPerPx, classes, veil: maps.veilAt(cx, cy), arcminPerPx };
}

/**
 * Where the gaze can be for a label to pass without moving the eyes: per direction around its
 * centre, the largest eccentricity of its far edge that passes (on the meridian the label then lies
 * on, seen from the gaze), less the box's half-extent in that direction. From the models alone.
 */
export function reachOf(label: Label, maps: LabelMaps, directions = 36): Reach {
  const g = geometryOf(label, maps);
  const [, , bw, bh] = label.boxPx;
  const directionsDeg: number[] = [];
  const radiusDeg: number[] = [];
  for (let k = 0; k < directions; k++) {
    const phi = (360 * k) / directions;
    const rad = (phi * Math.PI) / 180;
    // The label lies opposite the gaze's offset: on meridian φ + 180° of the gaze's field.
    const within = passesWithinDeg(label, g, { eccentricityDeg: 0, meridianDeg: (phi + 180) % 360, arcminPerPx: g.arcminPerPx, inBlindSpot: false }, maps);
    const halfExtentDeg = ((Math.abs(Math.cos(rad)) * bw + Math.abs(Math.sin(rad)) * bh) / 2) * g.arcminPerPx / 60;
    directionsDeg.push(phi);
    radiusDeg.push(within === null ? 0 : Math.max(0, within - halfExtentDeg));
  }
  return { directionsDeg, radiusDeg };
}

export function judgeLabel(label: Label, maps: LabelMaps): LabelVerdict {
  const role = label.role ?? 'look';
  const g = geometryOf(label, maps);
  const { arcminPerPx, classes, letterHeightArcmin } = g;
  const far = farthestPoint(label.boxPx, maps);
  const gazePlace: Place = { eccentricityDeg: maps.eccentricityDeg[far.index], meridianDeg: maps.meridianDeg[far.index], arcminPerPx: maps.arcminPerPx[far.index], inBlindSpot: far.inBlindSpot };
  const fixatedPlace: Place = { eccentricityDeg: 0, meridianDeg: 0, arcminPerPx, inBlindSpot: false };
  const fromGaze = judgeAt(label, g, gazePlace, maps);
  const whenFixated = judgeAt(label, g, fixatedPlace, maps);
  const counted = countedJudgement({ role, fromGaze, whenFixated });
  const verdict: Verdict = role === 'decorative' ? 'not judged' : counted.verdict;
  const passes = role === 'decorative' ? null : verdict === 'readable';
  const place = role === 'glance' ? gazePlace : fixatedPlace;
  // Crowding and the blind spot do not depend on the eye's optics: they hold for everyone or no one.
  // Contrast is judged for the proof's viewer only; the share is of those whose eyes read it at its size.
  const othersPass = counted.limits.every((l) => l.name === 'size' || l.name === 'contrast' || l.passes);
  const audience = role === 'decorative' || !maps.audienceAt ? undefined
    : othersPass ? maps.audienceAt(place.eccentricityDeg, place.meridianDeg, place.arcminPerPx, label.letterHeightPx) : { uncorrected: 0, corrected: 0 };
  return {
    id: label.id, text: label.text, role, boxPx: label.boxPx, letterHeightPx: label.letterHeightPx, letterHeightArcmin,
    letterAdvanceArcmin: g.letterAdvanceArcmin,
    contrast: { text: classes.text, background: classes.background, frameRatio: contrastRatio(classes.text, classes.background), requiredRatio: requiredRatio(letterHeightArcmin) },
    verdict, passes, fromGaze, whenFixated,
    ...(passes === false ? { fix: fixFor(label, g, counted, place, maps, role) } : {}),
    ...(audience ? { audience } : {}),
    ...(role === 'glance' ? { reach: reachOf(label, maps) } : {}),
  };
}
