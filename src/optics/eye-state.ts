/** The state of the viewer's eye while looking at the display: pupil, accommodation, defocus, blur. */
import type { Viewer } from '../config/setup.js';
import { radToArcmin } from '../units.js';
import { accommodationFor, blurCircleRad, hofstetterAmplitudeD } from './accommodation.js';
import { watsonYellottPupilMm } from './pupil.js';

export interface EyeState {
  pupilDiameterMm: number;
  pupilSource: 'setup' | 'watson-yellott-2012';
  /** True when the viewer's age lay outside 20–83 years and the pupil formula used the nearest end. */
  pupilAgeClamped: boolean;
  accommodationAmplitudeD: number;
  /** Accommodation available for sustained viewing: the amplitude less the reserve, D. */
  sustainedAccommodationD: number;
  /** Vergence of the display (or virtual image) at the eye, D. */
  targetVergenceD: number;
  accommodationDemandD: number;
  accommodationD: number;
  /** Residual spherical-equivalent defocus, D (see accommodationFor for the sign). */
  defocusD: number;
  /** Magnitude of the uncorrected cylinder, D. */
  astigmatismD: number;
  /** Length of the residual power vector, sqrt(M² + J0² + J45²) = sqrt(ΔM² + (C/2)²), D. */
  blurStrengthD: number;
  /** Angular diameter of the geometric blur circle for the blur strength, arcmin. */
  blurCircleArcmin: number;
}

export interface EyeStateInput {
  viewer: Viewer;
  adaptingLuminanceCdM2: number;
  adaptingFieldDeg: number;
  /** Distance from the eye to what it focuses on: the screen at the gaze, or a headset's virtual image. */
  focalDistanceM: number;
  /** Share of the amplitude kept in reserve in sustained viewing. */
  accommodationReserve: number;
}

export function computeEyeState(input: EyeStateInput): EyeState {
  const { viewer } = input;
  const pupil = viewer.pupilDiameterMm === 'auto'
    ? watsonYellottPupilMm({ luminanceCdM2: input.adaptingLuminanceCdM2, fieldDiameterDeg: input.adaptingFieldDeg, ageYears: viewer.ageYears, eyes: viewer.eyes === 'both' ? 2 : 1 })
    : { pupilDiameterMm: viewer.pupilDiameterMm, ageClamped: false };
  const amplitudeD = hofstetterAmplitudeD(viewer.ageYears);
  // Glasses for the display correct the refraction and add the display's vergence: the eye sees as a
  // myope whose far point is the display, with no cylinder.
  const forDisplay = viewer.glasses === 'display';
  const sphereD = forDisplay ? -1 / input.focalDistanceM : viewer.refraction.sphereD;
  const cylinderD = forDisplay ? 0 : viewer.refraction.cylinderD;
  // The eye focuses for the spherical equivalent (sphere + half the cylinder), the circle of least confusion.
  const state = accommodationFor(input.focalDistanceM, sphereD + cylinderD / 2, amplitudeD, input.accommodationReserve);
  const astigmatismD = Math.abs(cylinderD);
  // Blur strength: length of the power vector (Thibos et al. 2004; from memory), J magnitude = |C|/2.
  const blurStrengthD = Math.hypot(state.defocusD, astigmatismD / 2);
  return {
    pupilDiameterMm: pupil.pupilDiameterMm,
    pupilSource: viewer.pupilDiameterMm === 'auto' ? 'watson-yellott-2012' : 'setup',
    pupilAgeClamped: pupil.ageClamped,
    accommodationAmplitudeD: amplitudeD,
    sustainedAccommodationD: (1 - input.accommodationReserve) * amplitudeD,
    targetVergenceD: 1 / input.focalDistanceM,
    accommodationDemandD: state.demandD,
    accommodationD: state.accommodationD,
    defocusD: state.defocusD,
    astigmatismD,
    blurStrengthD,
    blurCircleArcmin: radToArcmin(blurCircleRad(pupil.pupilDiameterMm, blurStrengthD)),
  };
}
