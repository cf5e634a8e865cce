/**
 * Validation of setup files: once, at the edge, collecting every problem with its path, the value
 * received and what is allowed. Unknown keys are rejected with the nearest valid key as a hint.
 */
import { closest } from 'fastest-levenshtein';
import { ConfigError, type ConfigProblem } from '../errors.js';
import { inchToMm } from '../units.js';
import { describeExpected, type Decl, type ObjectDecl } from './declare.js';
import { headsetDecl, screenDecl, sectionDecls } from './params.js';
import { defaultDisplayPreset, defaultViewerPreset, displayPresets, findPreset, viewerPresets, type Preset } from './presets.js';
import type { Display, Setup } from './setup.js';

/** Keys a setup file may hold at its top level besides the sections. */
const topLevelExtras = ['$schema', 'description'] as const;

type Json = Record<string, unknown>;

const isObject = (v: unknown): v is Json => typeof v === 'object' && v !== null && !Array.isArray(v);

/**
 * Deep merge of plain objects; arrays and values in `over` replace those in `base`. Keys are defined
 * as own properties (a key named "__proto__" stays a key, for validation to refuse).
 */
export function mergeSetupJson(base: Json, over: Json): Json {
  const out: Json = { ...base };
  for (const [key, value] of Object.entries(over)) {
    const baseValue = Object.hasOwn(base, key) ? base[key] : undefined;
    Object.defineProperty(out, key, { value: isObject(value) && isObject(baseValue) ? mergeSetupJson(baseValue, value) : value, enumerable: true, writable: true, configurable: true });
  }
  return out;
}

/** A field of a JSON object, own properties only (never one inherited from Object.prototype). */
const own = (value: Json, key: string): unknown => (Object.hasOwn(value, key) ? value[key] : undefined);

function suggestion(key: string, allowed: readonly string[]): string | undefined {
  if (allowed.length === 0) return undefined;
  const best = closest(key, [...allowed]);
  return `did you mean "${best}"? Allowed keys: ${allowed.join(', ')}`;
}

/** Checks one value against its declaration; returns the value with defaults filled in. */
function checkValue(value: unknown, decl: Decl, path: string, problems: ConfigProblem[]): unknown {
  const fail = (): undefined => {
    problems.push({ path, received: value, expected: describeExpected(decl) });
    return undefined;
  };
  switch (decl.type) {
    case 'number': {
      if (value === undefined) return decl.default;
      if (typeof value === 'string' && decl.words?.includes(value)) return value;
      if (typeof value !== 'number' || !Number.isFinite(value)) return fail();
      if (value < decl.minimum || value > decl.maximum) return fail();
      if (decl.integer && !Number.isInteger(value)) return fail();
      return value;
    }
    case 'enum':
      if (value === undefined) return decl.default;
      return typeof value === 'string' && decl.values.includes(value) ? value : fail();
    case 'tuple': {
      if (value === undefined) return decl.default ? [...decl.default] : undefined;
      if (!Array.isArray(value) || value.length !== decl.names.length) return fail();
      const items = value.map((v, i) => checkValue(v, { ...decl.item, doc: '' }, `${path}[${i}]`, problems));
      return items.some((v) => v === undefined) ? undefined : items;
    }
    case 'list': {
      if (value === undefined) return undefined;
      if (!Array.isArray(value) || value.length > decl.maxItems) return fail();
      const items = value.map((v, i) => checkValue(v, { ...decl.item, doc: '' }, `${path}[${i}]`, problems));
      return items.some((v) => v === undefined) ? undefined : items;
    }
    case 'object':
      if (value === undefined) value = {};
      if (!isObject(value)) return fail();
      return checkObject(value, decl, path, problems);
  }
}

function checkObject(value: Json, decl: ObjectDecl, path: string, problems: ConfigProblem[], alsoAllowed: readonly string[] = [], elsewhere?: { decl: ObjectDecl; where: string }): Json {
  const out: Json = {};
  const allowed = Object.keys(decl.fields);
  for (const key of Object.keys(value)) {
    if (Object.hasOwn(decl.fields, key) || alsoAllowed.includes(key)) continue;
    const hint = elsewhere && Object.hasOwn(elsewhere.decl.fields, key) ? `this key is only for ${elsewhere.where}` : suggestion(key, allowed);
    problems.push({ path: `${path}.${key}`, received: own(value, key), expected: 'no such key', hint });
  }
  for (const [key, fieldDecl] of Object.entries(decl.fields)) {
    const checked = checkValue(own(value, key), fieldDecl, `${path}.${key}`, problems);
    if (checked !== undefined) out[key] = checked;
  }
  return out;
}

function applyPreset(section: Json | undefined, list: readonly Preset[], fallback: string | undefined, path: string, problems: ConfigProblem[]): { merged: Json; name?: string } {
  const given = section ?? {};
  const hasPreset = Object.hasOwn(given, 'preset');
  if (hasPreset && typeof given.preset !== 'string') {
    problems.push({ path: `${path}.preset`, received: given.preset, expected: `a preset name: one of ${list.map((p) => `"${p.name}"`).join(', ')}` });
    return { merged: given };
  }
  const requested = hasPreset ? given.preset : Object.keys(given).length === 0 ? fallback : undefined;
  if (requested === undefined) return { merged: given };
  const preset = typeof requested === 'string' ? findPreset(list, requested) : undefined;
  if (!preset) {
    problems.push({
      path: `${path}.preset`, received: requested,
      expected: `one of ${list.map((p) => `"${p.name}"`).join(', ')}`,
      hint: typeof requested === 'string' ? suggestion(requested, list.map((p) => p.name)) : undefined,
    });
    return { merged: given };
  }
  const { preset: _drop, ...overrides } = given;
  return { merged: mergeSetupJson(preset.values, overrides), name: preset.name };
}

function checkDisplay(raw: Json, problems: ConfigProblem[]): Display | undefined {
  const kind = own(raw, 'kind');
  if (kind !== 'screen' && kind !== 'headset') {
    problems.push({ path: 'display.kind', received: kind, expected: 'one of "screen", "headset"' });
    // Keys neither kind knows are named even so.
    const known = [...new Set([...Object.keys(screenDecl.fields), ...Object.keys(headsetDecl.fields), 'kind', 'preset'])];
    for (const key of Object.keys(raw)) {
      if (!known.includes(key)) problems.push({ path: `display.${key}`, received: own(raw, key), expected: 'no such key', hint: suggestion(key, known) });
    }
    return undefined;
  }
  const before = problems.length;
  const decl = kind === 'screen' ? screenDecl : headsetDecl;
  const other = kind === 'screen' ? { decl: headsetDecl, where: 'headset displays ("kind": "headset")' } : { decl: screenDecl, where: 'screen displays ("kind": "screen")' };
  const d = checkObject(raw, decl, 'display', problems, ['kind', 'preset'], other);
  const need = (key: string, what: string): void => {
    if (raw[key] === undefined) problems.push({ path: `display.${key}`, received: undefined, expected: what });
  };
  need('resolutionPx', describeExpected(decl.fields.resolutionPx));
  need('peakLuminanceCdM2', describeExpected(decl.fields.peakLuminanceCdM2));
  if (typeof d.peakLuminanceCdM2 === 'number' && typeof d.blackLuminanceCdM2 === 'number' && d.blackLuminanceCdM2 >= d.peakLuminanceCdM2) {
    problems.push({ path: 'display.blackLuminanceCdM2', received: d.blackLuminanceCdM2, expected: `a luminance below peakLuminanceCdM2 (${d.peakLuminanceCdM2} cd/m²)` });
  }
  const resolution = d.resolutionPx as [number, number] | undefined;

  if (kind === 'screen') {
    need('viewingDistanceMm', describeExpected(screenDecl.fields.viewingDistanceMm));
    const hasSize = raw.widthMm !== undefined || raw.heightMm !== undefined;
    if (hasSize && raw.diagonalIn !== undefined) {
      problems.push({ path: 'display.diagonalIn', received: raw.diagonalIn, expected: 'nothing when widthMm and heightMm are given (give one or the other)' });
    } else if (hasSize) {
      need('widthMm', describeExpected(screenDecl.fields.widthMm));
      need('heightMm', describeExpected(screenDecl.fields.heightMm));
    } else if (raw.diagonalIn === undefined) {
      problems.push({ path: 'display.widthMm', received: undefined, expected: 'widthMm and heightMm in mm, or diagonalIn in inches' });
    }
    if (problems.length > before || !resolution) return undefined;
    let widthMm = d.widthMm as number | undefined;
    let heightMm = d.heightMm as number | undefined;
    if (widthMm === undefined || heightMm === undefined) {
      // Square pixels: the diagonal splits in the ratio of the resolution.
      const diagonalPx = Math.hypot(resolution[0], resolution[1]);
      widthMm = (inchToMm(d.diagonalIn as number) * resolution[0]) / diagonalPx;
      heightMm = (inchToMm(d.diagonalIn as number) * resolution[1]) / diagonalPx;
    }
    return {
      kind, widthMm, heightMm, resolutionPx: resolution, viewingDistanceMm: d.viewingDistanceMm as number,
      eyeOffsetMm: d.eyeOffsetMm as [number, number], peakLuminanceCdM2: d.peakLuminanceCdM2 as number, blackLuminanceCdM2: d.blackLuminanceCdM2 as number,
    };
  }

  need('fieldOfViewDeg', describeExpected(headsetDecl.fields.fieldOfViewDeg));
  const hasLens = raw.lens !== undefined;
  if (hasLens && raw.focalDistanceM !== undefined) {
    problems.push({ path: 'display.lens', received: raw.lens, expected: 'nothing when focalDistanceM is given (give one or the other)' });
  } else if (!hasLens && raw.focalDistanceM === undefined) {
    problems.push({ path: 'display.focalDistanceM', received: undefined, expected: 'the virtual image distance in m (0.1 to 1000), or a lens object' });
  }
  const lens = hasLens ? (d.lens as { focalLengthMm?: number; screenDistanceMm?: number; eyeReliefMm: number }) : undefined;
  if (lens) {
    if (lens.focalLengthMm === undefined) problems.push({ path: 'display.lens.focalLengthMm', received: undefined, expected: 'a number from 5 to 500 mm' });
    if (lens.screenDistanceMm === undefined) problems.push({ path: 'display.lens.screenDistanceMm', received: undefined, expected: 'a number from 1 to 500 mm' });
    else if (lens.focalLengthMm !== undefined && lens.screenDistanceMm >= lens.focalLengthMm) {
      problems.push({ path: 'display.lens.screenDistanceMm', received: lens.screenDistanceMm, expected: `a distance shorter than lens.focalLengthMm (${lens.focalLengthMm} mm), so the lens forms a virtual image` });
    }
  }
  if (problems.length > before || !resolution) return undefined;
  let focalDistanceM = d.focalDistanceM as number | undefined;
  let resolvedLens;
  if (lens) {
    resolvedLens = { focalLengthMm: lens.focalLengthMm!, screenDistanceMm: lens.screenDistanceMm!, eyeReliefMm: lens.eyeReliefMm };
    focalDistanceM = virtualImageDistanceM(resolvedLens);
  }
  const sharpness = d.lensSharpness as { fieldAnglesDeg?: number[]; mtf50Cpd?: number[] } | undefined;
  let lensSharpness: { fieldAnglesDeg: number[]; mtf50Cpd: number[] } | undefined;
  if (sharpness && (sharpness.fieldAnglesDeg || sharpness.mtf50Cpd)) {
    const angles = sharpness.fieldAnglesDeg ?? [];
    const mtf = sharpness.mtf50Cpd ?? [];
    if (angles.length === 0 || angles.length !== mtf.length) {
      problems.push({ path: 'display.lensSharpness', received: raw.lensSharpness, expected: 'fieldAnglesDeg and mtf50Cpd lists of the same, non-zero length' });
    } else if (angles.some((a, i) => i > 0 && a <= angles[i - 1])) {
      problems.push({ path: 'display.lensSharpness.fieldAnglesDeg', received: angles, expected: 'increasing field angles' });
    } else lensSharpness = { fieldAnglesDeg: angles, mtf50Cpd: mtf };
  }
  if (problems.length > before) return undefined;
  const transmission = d.opticalTransmission as number;
  return {
    kind, resolutionPx: resolution, fieldOfViewDeg: d.fieldOfViewDeg as [number, number], focalDistanceM: focalDistanceM!,
    ...(resolvedLens ? { lens: resolvedLens } : {}),
    ...(lensSharpness ? { lensSharpness } : {}),
    opticalTransmission: transmission,
    peakLuminanceCdM2: (d.peakLuminanceCdM2 as number) * transmission, blackLuminanceCdM2: (d.blackLuminanceCdM2 as number) * transmission,
  };
}

/**
 * Distance from the eye to the virtual image of a thin magnifier with the panel inside its focal
 * length: image distance v = d·f/(f − d) on the panel's side, plus the eye relief (thin-lens law).
 */
export function virtualImageDistanceM(lens: { focalLengthMm: number; screenDistanceMm: number; eyeReliefMm: number }): number {
  const f = lens.focalLengthMm;
  const d = lens.screenDistanceMm;
  const imageDistanceMm = (d * f) / (f - d);
  return (imageDistanceMm + lens.eyeReliefMm) / 1000;
}

/**
 * Validates a setup (already parsed JSON) and resolves presets and defaults.
 * `source` names the file (or `built-in defaults`) in messages. Throws ConfigError with every problem.
 */
export function validateSetup(input: unknown, source: string): Setup {
  const problems: ConfigProblem[] = [];
  if (!isObject(input)) throw new ConfigError(source, [{ path: '(top level)', received: input, expected: 'a JSON object with display, viewer, light, gaze, frame or models' }]);
  const sections = ['display', ...Object.keys(sectionDecls)];
  for (const key of Object.keys(input)) {
    if (sections.includes(key) || (topLevelExtras as readonly string[]).includes(key)) continue;
    problems.push({ path: key, received: input[key], expected: 'no such key', hint: suggestion(key, sections) });
  }
  for (const key of ['display', 'viewer']) {
    if (input[key] !== undefined && !isObject(input[key])) problems.push({ path: key, received: input[key], expected: 'an object' });
  }
  const beforeDisplay = problems.length;
  const displayIn = applyPreset(isObject(input.display) ? input.display : undefined, displayPresets, defaultDisplayPreset, 'display', problems);
  const display = problems.length === beforeDisplay && (input.display === undefined || isObject(input.display)) ? checkDisplay(displayIn.merged, problems) : undefined;
  const viewerIn = resolveViewer(isObject(input.viewer) ? input.viewer : undefined, 'viewer', problems);
  const light = checkValue(input.light, sectionDecls.light, 'light', problems) as Json | undefined;
  const frame = checkValue(input.frame, sectionDecls.frame, 'frame', problems) as Json | undefined;
  const models = checkValue(input.models, sectionDecls.models, 'models', problems) as Json | undefined;
  const perceptIn = isObject(input.percept) ? input.percept : undefined;
  if (input.percept !== undefined && !perceptIn) problems.push({ path: 'percept', received: input.percept, expected: 'an object' });
  const percept = checkObject(perceptIn ?? {}, sectionDecls.percept, 'percept', problems, ['referenceViewer']);
  const referenceRaw = perceptIn?.referenceViewer;
  let referenceIn: { viewer?: Setup['viewer']; name?: string } = {};
  if (typeof referenceRaw === 'string' || referenceRaw === undefined) {
    referenceIn = resolveViewer({ preset: referenceRaw ?? DEFAULT_REFERENCE_VIEWER }, 'percept.referenceViewer', problems);
  } else if (isObject(referenceRaw)) {
    referenceIn = resolveViewer(referenceRaw, 'percept.referenceViewer', problems);
  } else {
    problems.push({ path: 'percept.referenceViewer', received: referenceRaw, expected: `a viewer preset name (${viewerPresets.map((p) => `"${p.name}"`).join(', ')}) or a viewer object` });
  }
  let gaze: Setup['gaze'];
  if (input.gaze !== undefined) {
    const g = checkValue(input.gaze, sectionDecls.gaze, 'gaze', problems) as Json | undefined;
    if (g && (g.xPx === undefined || g.yPx === undefined)) {
      problems.push({ path: 'gaze', received: input.gaze, expected: 'both xPx and yPx' });
    } else if (g) gaze = { xPx: g.xPx as number, yPx: g.yPx as number, ...(g.focusDistanceM !== undefined ? { focusDistanceM: g.focusDistanceM as number } : {}) };
  }
  if (problems.length > 0 || !display || !viewerIn.viewer || !referenceIn.viewer || !light || !frame || !models) throw new ConfigError(source, problems);
  const mode = percept.mode as Setup['percept']['mode'] | undefined;
  return {
    display,
    viewer: viewerIn.viewer,
    light: {
      adaptingLuminanceCdM2: (light.adaptingLuminanceCdM2 as number | 'auto' | undefined) ?? 'auto',
      adaptingFieldDeg: light.adaptingFieldDeg as number,
      ...(light.surroundLuminanceCdM2 !== undefined ? { surroundLuminanceCdM2: light.surroundLuminanceCdM2 as number } : {}),
    },
    gaze,
    frame: {
      backgroundRgb: frame.backgroundRgb as [number, number, number], pixelRatio: frame.pixelRatio as number,
      ...(frame.placementPx ? { placementPx: frame.placementPx as [number, number, number, number] } : {}),
    },
    percept: {
      mode: mode ?? (display.kind === 'headset' ? 'retinal-image' : 'same-display'),
      modeFrom: mode ? 'setup' : 'display kind',
      referenceViewer: referenceIn.viewer,
      ...(referenceIn.name ? { referenceViewerName: referenceIn.name } : {}),
    },
    models: {
      accommodationReserve: models.accommodationReserve as number,
      lensColour: models.lensColour as Setup['models']['lensColour'],
      acuity: models.acuity as Setup['models']['acuity'],
      colourLoss: models.colourLoss as Setup['models']['colourLoss'],
    },
    presetNames: { display: displayIn.name, viewer: viewerIn.name },
  };
}

/** The viewer who looks at a same-display percept, when the setup names none (common practice: a young adult with normal sight). */
export const DEFAULT_REFERENCE_VIEWER = 'age-25';

/** A viewer section (preset plus overrides), checked; problems are collected under `path`. */
function resolveViewer(section: Json | undefined, path: string, problems: ConfigProblem[]): { viewer?: Setup['viewer']; name?: string } {
  const before = problems.length;
  const viewerIn = applyPreset(section, viewerPresets, defaultViewerPreset, path, problems);
  const { preset: _p, ...viewerFields } = viewerIn.merged;
  const viewer = checkValue(viewerFields, sectionDecls.viewer, path, problems) as Json | undefined;
  const wavefront = wavefrontOf(viewer?.wavefront as Json | undefined, path, problems);
  if (!viewer || problems.length > before) return {};
  return {
    name: viewerIn.name,
    viewer: {
      ageYears: viewer.ageYears as number,
      refraction: viewer.refraction as Setup['viewer']['refraction'],
      pupilDiameterMm: (viewer.pupilDiameterMm as number | 'auto' | undefined) ?? 'auto',
      eyes: viewer.eyes as Setup['viewer']['eyes'],
      glasses: viewer.glasses as Setup['viewer']['glasses'],
      eyePigmentation: viewer.eyePigmentation as number,
      ...wavefront,
    },
  };
}

function wavefrontOf(w: Json | undefined, path: string, problems: ConfigProblem[]): { wavefront?: Setup['viewer']['wavefront'] } {
  if (!w || (w.pupilDiameterMm === undefined && w.coefficientsUm === undefined)) return {};
  if (w.pupilDiameterMm === undefined || w.coefficientsUm === undefined) {
    problems.push({ path: `${path}.wavefront`, received: w, expected: 'both pupilDiameterMm and coefficientsUm' });
    return {};
  }
  return { wavefront: { pupilDiameterMm: w.pupilDiameterMm as number, coefficientsUm: w.coefficientsUm as number[] } };
}

/** Checks the gaze against the frame size (the frame is only known when it has been read): inside it or on the display plane around it. */
export function checkGazeInFrame(setup: Setup, widthPx: number, heightPx: number, source: string): void {
  const g = setup.gaze;
  if (!g) return;
  const problems: ConfigProblem[] = [];
  const range = (size: number): [number, number] => [-2 * size, 3 * size - 1];
  const [x0, x1] = range(widthPx);
  const [y0, y1] = range(heightPx);
  if (g.xPx < x0 || g.xPx > x1) problems.push({ path: 'gaze.xPx', received: g.xPx, expected: `a column from ${x0} to ${x1}: inside the ${widthPx} px wide frame or up to two frame widths beyond it` });
  if (g.yPx < y0 || g.yPx > y1) problems.push({ path: 'gaze.yPx', received: g.yPx, expected: `a row from ${y0} to ${y1}: inside the ${heightPx} px high frame or up to two frame heights beyond it` });
  if (problems.length) throw new ConfigError(source, problems);
}
