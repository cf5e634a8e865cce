/** The validated, resolved setup that the pipeline works from. Every number has its unit in its name. */

export interface ScreenDisplay {
  kind: 'screen';
  widthMm: number;
  heightMm: number;
  resolutionPx: [number, number];
  viewingDistanceMm: number;
  /** Eye position relative to the screen centre, in the screen plane: [right, up]. */
  eyeOffsetMm: [number, number];
  peakLuminanceCdM2: number;
  blackLuminanceCdM2: number;
}

export interface HeadsetLens {
  focalLengthMm: number;
  screenDistanceMm: number;
  eyeReliefMm: number;
}

export interface HeadsetDisplay {
  kind: 'headset';
  resolutionPx: [number, number];
  fieldOfViewDeg: [number, number];
  /** Distance of the virtual image, given or derived from `lens`. */
  focalDistanceM: number;
  lens?: HeadsetLens;
  /** MTF50 of the headset lens by field angle; undefined for a perfect lens. */
  lensSharpness?: { fieldAnglesDeg: number[]; mtf50Cpd: number[] };
  /** Share of the panel's light passed by the optics; already applied to the luminances below. */
  opticalTransmission: number;
  peakLuminanceCdM2: number;
  blackLuminanceCdM2: number;
}

export type Display = ScreenDisplay | HeadsetDisplay;

export type Eyes = 'right' | 'left' | 'both';

export interface Viewer {
  ageYears: number;
  refraction: { sphereD: number; cylinderD: number; axisDeg: number };
  pupilDiameterMm: number | 'auto';
  eyes: Eyes;
  /** 'display': glasses that correct the refraction and put the display's distance in focus. */
  glasses: 'none' | 'display';
  eyePigmentation: number;
  /** Measured Zernike coefficients (µm, ANSI j order) over a stated pupil. */
  wavefront?: { pupilDiameterMm: number; coefficientsUm: number[] };
}

export interface Light {
  adaptingLuminanceCdM2: number | 'auto';
  adaptingFieldDeg: number;
  /** Luminance around the frame, cd/m²; undefined: the display's black level (a dark room). */
  surroundLuminanceCdM2?: number;
}

export type PerceptMode = 'same-display' | 'retinal-image';

export interface PerceptSettings {
  mode: PerceptMode;
  /** Whether the mode was given or follows from the display kind. */
  modeFrom: 'setup' | 'display kind' | 'command line';
  /** The viewer who looks at a same-display percept. */
  referenceViewer: Viewer;
  referenceViewerName?: string;
}

export interface GazePx {
  xPx: number;
  yPx: number;
  /** Distance the eye focuses at while looking there, m (default: the display plane at the gaze). */
  focusDistanceM?: number;
}

export type AcuityModelName = 'rgc-sampling' | 'contrast-threshold';

export interface Setup {
  display: Display;
  viewer: Viewer;
  light: Light;
  /** Undefined means the centre of the frame. */
  gaze?: GazePx;
  frame: { backgroundRgb: [number, number, number]; pixelRatio: number; placementPx?: [number, number, number, number] };
  percept: PerceptSettings;
  models: {
    /** Share of the accommodation amplitude kept in reserve in sustained viewing. */
    accommodationReserve: number;
    /** How the ageing lens's colour shows: as received by the cones, or after adapting to the display's white. */
    lensColour: 'received' | 'adapted';
    acuity: AcuityModelName;
    colourLoss: { redGreenFovealCutoffCpd: number; blueYellowFovealCutoffCpd: number; redGreenEccentricityScale: number; blueYellowEccentricityScale: number };
  };
  /** Names of the presets the setup started from, for captions and the report. */
  presetNames: { display?: string; viewer?: string };
}
