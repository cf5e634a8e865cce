/**
 * Declarations of every setup parameter. This is the one place where names, units, ranges,
 * defaults and sources are written; validation, the JSON Schema and the README table derive from it.
 */
import type { ObjectDecl } from './declare.js';

const luminance = {
  peakLuminanceCdM2: {
    type: 'number', unit: 'cd/m²', minimum: 0.01, maximum: 100000,
    doc: 'Luminance of full white on the display (after any lens transmission).',
  },
  blackLuminanceCdM2: {
    type: 'number', unit: 'cd/m²', minimum: 0, maximum: 1000, default: 0,
    doc: 'Luminance of full black on the display, including reflected room light.',
  },
} as const;

const resolutionPx = {
  type: 'tuple', names: ['width', 'height'], item: { type: 'number', unit: 'px', minimum: 16, maximum: 16384, integer: true },
  doc: 'Pixels of the display (or of one eye buffer). A frame of another size but the same aspect ratio is scaled to fill it.',
} as const;

export const screenDecl: ObjectDecl = {
  type: 'object',
  doc: 'A flat screen viewed from a stated distance.',
  fields: {
    widthMm: { type: 'number', unit: 'mm', minimum: 10, maximum: 20000, doc: 'Width of the active area. Give width and height, or diagonalIn.' },
    heightMm: { type: 'number', unit: 'mm', minimum: 10, maximum: 20000, doc: 'Height of the active area.' },
    diagonalIn: { type: 'number', unit: 'in', minimum: 1, maximum: 500, doc: 'Diagonal of the active area; width and height follow from the resolution’s aspect ratio (square pixels).' },
    resolutionPx,
    viewingDistanceMm: { type: 'number', unit: 'mm', minimum: 100, maximum: 50000, doc: 'Distance from the eye to the screen plane, along the screen’s normal.' },
    eyeOffsetMm: {
      type: 'tuple', names: ['right', 'up'], item: { type: 'number', unit: 'mm', minimum: -20000, maximum: 20000 }, default: [0, 0],
      doc: 'Where the eye sits relative to the screen centre, in the screen plane (x to the right, y up).',
    },
    ...luminance,
  },
};

export const headsetDecl: ObjectDecl = {
  type: 'object',
  doc: 'One eye buffer of a head-mounted display in rectilinear (tangent-space) projection.',
  fields: {
    resolutionPx,
    fieldOfViewDeg: {
      type: 'tuple', names: ['horizontal', 'vertical'], item: { type: 'number', unit: '°', minimum: 1, maximum: 170 },
      doc: 'Field of view of the eye buffer, symmetric about the lens axis.',
    },
    focalDistanceM: { type: 'number', unit: 'm', minimum: 0.1, maximum: 1000, doc: 'Distance of the virtual image. Give this or lens.' },
    lens: {
      type: 'object', doc: 'A thin magnifier lens; the virtual image distance follows from it.',
      fields: {
        focalLengthMm: { type: 'number', unit: 'mm', minimum: 5, maximum: 500, doc: 'Focal length of the lens.' },
        screenDistanceMm: { type: 'number', unit: 'mm', minimum: 1, maximum: 500, doc: 'Distance from the lens to the panel; less than the focal length.' },
        eyeReliefMm: {
          type: 'number', unit: 'mm', minimum: 0, maximum: 100, default: 12,
          doc: 'Distance from the lens to the eye.', source: 'common practice (10–20 mm in headsets)',
        },
      },
    },
    lensSharpness: {
      type: 'object', doc: 'How sharp the headset lens is across the field: MTF50 (the frequency it passes at 50 % contrast) at a few field angles from the lens axis, interpolated linearly. Omit for a perfect lens.',
      fields: {
        fieldAnglesDeg: { type: 'list', maxItems: 16, item: { type: 'number', unit: '°', minimum: 0, maximum: 85 }, doc: 'Field angles from the lens axis, increasing.' },
        mtf50Cpd: { type: 'list', maxItems: 16, item: { type: 'number', unit: 'cpd', minimum: 0.5, maximum: 200 }, doc: 'The lens\'s MTF50 at each field angle.' },
      },
    },
    opticalTransmission: {
      type: 'number', unit: '', minimum: 0.01, maximum: 1, default: 1,
      doc: 'Share of the panel\'s light the headset optics pass; multiplies peakLuminanceCdM2 and blackLuminanceCdM2.',
    },
    ...luminance,
  },
};

export const viewerDecl: ObjectDecl = {
  type: 'object',
  doc: 'The viewer whose eye is modelled.',
  fields: {
    ageYears: {
      type: 'number', unit: 'years', minimum: 1, maximum: 110, default: 25,
      doc: 'Age; sets accommodation (Hofstetter 1950) and pupil (Watson & Yellott 2012, valid 20–83: outside that the formula is clamped).',
    },
    refraction: {
      type: 'object', doc: 'The refractive error left uncorrected while viewing (after any glasses or lenses worn).',
      fields: {
        sphereD: { type: 'number', unit: 'D', minimum: -30, maximum: 30, default: 0, doc: 'Sphere; + is hyperopic (needs more accommodation), − is myopic.' },
        cylinderD: { type: 'number', unit: 'D', minimum: -10, maximum: 10, default: 0, doc: 'Cylinder (either sign convention; its magnitude is used).' },
        axisDeg: { type: 'number', unit: '°', minimum: 0, maximum: 180, default: 0, doc: 'Cylinder axis.' },
      },
    },
    pupilDiameterMm: {
      type: 'number', unit: 'mm', minimum: 1, maximum: 9, words: ['auto'], default: undefined,
      doc: 'Pupil diameter, or "auto" from light, field size, age and eyes (Watson & Yellott 2012). Default "auto".',
    },
    eyes: { type: 'enum', values: ['right', 'left', 'both'], default: 'both', doc: 'Which eye(s) view the frame.' },
    glasses: {
      type: 'enum', values: ['none', 'display'], default: 'none',
      doc: 'none: the refraction above is what the viewer sees through. display: single-vision glasses for the display\'s distance (reading or computer glasses) correct the refraction and put the display in focus without accommodating; other distances (a depth map) are out of focus by their difference.',
      source: 'standard optics',
    },
    wavefront: {
      type: 'object',
      doc: 'Measured aberrations of this eye (optional). When given they replace the typical eye\'s higher-order aberrations and residual; refraction still applies on top.',
      fields: {
        pupilDiameterMm: { type: 'number', unit: 'mm', minimum: 1, maximum: 9, doc: 'Pupil diameter over which the coefficients were measured; a larger pupil is limited to it.' },
        coefficientsUm: {
          type: 'list', maxItems: 28, item: { type: 'number', unit: 'µm', minimum: -20, maximum: 20 },
          doc: 'Zernike coefficients in µm by ANSI Z80.28 single index j = 0, 1, 2, … (piston and tilts, j 0–2, are ignored).',
          source: 'ANSI Z80.28',
        },
      },
    },
    eyePigmentation: {
      type: 'number', unit: '', minimum: 0, maximum: 1.2, default: 0.5,
      doc: 'Pigmentation of the eye for stray light: 0 very dark, 0.5 brown, 1.0 light, 1.2 very light blue.',
      source: 'CIE 180:2010 disability glare equation (category values from memory)',
    },
  },
};

export const lightDecl: ObjectDecl = {
  type: 'object',
  doc: 'The light the viewer is adapted to.',
  fields: {
    adaptingLuminanceCdM2: {
      type: 'number', unit: 'cd/m²', minimum: 0.000001, maximum: 100000, words: ['auto'],
      doc: 'Luminance the eye adapts to, or "auto": the mean luminance of the frame within the adapting field around the gaze. Default "auto".',
    },
    adaptingFieldDeg: {
      type: 'number', unit: '°', minimum: 1, maximum: 180, default: 60,
      doc: 'Diameter of the adapting field (used by the pupil model).', source: 'Watson & Yellott 2012 use the field area in deg²',
    },
    surroundLuminanceCdM2: {
      type: 'number', unit: 'cd/m²', minimum: 0, maximum: 100000,
      doc: 'Luminance of what surrounds the frame in the field of view (a dark bridge, a lit room, daylight); its stray light falls on the frame. Default: the display\'s black level (a dark room).',
    },
  },
};

export const perceptDecl: ObjectDecl = {
  type: 'object',
  doc: 'What percept.png shows.',
  fields: {
    mode: {
      type: 'enum', values: ['same-display', 'retinal-image'],
      doc: 'same-display: what to show on this display so that the reference viewer, looking at it from the same place, sees what the simulated viewer sees (the default for screens); retinal-image: the image on the simulated retina (the default for headsets, whose eye buffers are reviewed magnified).',
      source: 'the relative-transfer method of Peli (1996), JOSA A 13(6):1131',
    },
  },
};

export const gazeDecl: ObjectDecl = {
  type: 'object',
  doc: 'Where the viewer looks, in frame pixels (default: the frame centre). A point outside the frame (the road above a cluster) lies on the display plane, up to two frame sizes beyond each edge.',
  fields: {
    xPx: { type: 'number', unit: 'px', minimum: -32768, maximum: 49152, doc: 'Column of the gaze point (0 = left edge of the frame; negative or beyond the width = outside the frame).' },
    yPx: { type: 'number', unit: 'px', minimum: -32768, maximum: 49152, doc: 'Row of the gaze point (0 = top edge of the frame).' },
    focusDistanceM: {
      type: 'number', unit: 'm', minimum: 0.1, maximum: 1e6,
      doc: 'Distance the eye focuses at while looking there (e.g. the road, 20 m, for a driver glancing at a cluster); default: the display plane at the gaze point.',
    },
  },
};

export const frameDecl: ObjectDecl = {
  type: 'object',
  doc: 'How the frame file is read.',
  fields: {
    backgroundRgb: {
      type: 'tuple', names: ['red', 'green', 'blue'], item: { type: 'number', unit: '', minimum: 0, maximum: 255, integer: true },
      default: [0, 0, 0], doc: 'sRGB 8-bit colour that transparent pixels are composited over (as a compositor does, in encoded values).',
    },
    pixelRatio: {
      type: 'number', unit: '', minimum: 0.05, maximum: 8, default: 1,
      doc: 'Frame pixels per display pixel of the design (2 for an @2x export). Fixes are given in design units too (frame px / pixelRatio).',
    },
    placementPx: {
      type: 'tuple', names: ['x', 'y', 'width', 'height'], item: { type: 'number', unit: 'px', minimum: 0, maximum: 16384 },
      doc: 'Where the frame sits on the display, in display pixels: a crop or one widget. Default: the frame fills the display.',
    },
  },
};

export const modelsDecl: ObjectDecl = {
  type: 'object',
  doc: 'Which published model is used where there is a choice.',
  fields: {
    accommodationReserve: {
      type: 'number', unit: '', minimum: 0, maximum: 0.9, default: 1 / 3,
      doc: 'Share of the amplitude of accommodation kept in reserve in sustained viewing; the eye supplies at most the rest.',
      source: 'common practice (keep a third to a half in reserve for comfortable near work)',
    },
    lensColour: {
      type: 'enum', values: ['received', 'adapted'], default: 'received',
      doc: 'How the ageing lens\'s colour shows in the percept: received — the cone signals as they arrive (whites turn yellowish, blue dims; Pokorny, Smith & Lutze 1987); adapted — after the eye adapts to the display\'s white (white stays neutral, blue still dims against it).',
      source: 'Pokorny, Smith & Lutze (1987); CIE 170-1:2006; adaptation after Werner & Schefrin (1993), from memory',
    },
    acuity: {
      type: 'enum', values: ['rgc-sampling', 'contrast-threshold'], default: 'rgc-sampling',
      doc: 'rgc-sampling: Nyquist limit of one midget ganglion-cell lattice (Watson 2014); contrast-threshold: cutoff of the Geisler & Perry (1998) threshold model.',
    },
    colourLoss: {
      type: 'object',
      doc: 'Our proposal for the loss of colour resolution with eccentricity: a contrast threshold rising with frequency as Geisler & Perry\'s for luminance, the eccentricity term scaled per opponent channel.',
      fields: {
        redGreenFovealCutoffCpd: {
          type: 'number', unit: 'cpd', minimum: 1, maximum: 60, default: 11,
          doc: 'Finest red–green (isoluminant) detail resolved at the gaze.', source: 'about 11 cpd for isoluminant red–green gratings, Mullen (1985), from memory',
        },
        blueYellowFovealCutoffCpd: {
          type: 'number', unit: 'cpd', minimum: 1, maximum: 60, default: 10,
          doc: 'Finest blue–yellow detail resolved near the gaze (outside the S-cone-free centre).', source: 'about 10 cpd, Mullen (1985), from memory',
        },
        redGreenEccentricityScale: {
          type: 'number', unit: '', minimum: 0.5, maximum: 5, default: 2,
          doc: 'How much faster than luminance red–green sensitivity falls with eccentricity.', source: 'about twice as steeply as luminance, Mullen (1991)',
        },
        blueYellowEccentricityScale: {
          type: 'number', unit: '', minimum: 0.5, maximum: 5, default: 1,
          doc: 'How much faster than luminance blue–yellow sensitivity falls with eccentricity.', source: 'about like luminance, Mullen & Kingdom (2002)',
        },
      },
    },
  },
};

/** Top-level sections of a setup file. `display` depends on `display.kind`. */
export const sectionDecls = {
  viewer: viewerDecl,
  light: lightDecl,
  gaze: gazeDecl,
  frame: frameDecl,
  percept: perceptDecl,
  models: modelsDecl,
} as const;
