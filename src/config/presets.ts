/**
 * Built-in display and viewer presets. Each is a partial setup section in the same JSON shape a
 * user writes, so a preset is validated like any setup. The numbers are typical values, not any
 * product's specification; `basis` gives the arithmetic behind each.
 */

export interface Preset {
  name: string;
  summary: string;
  /** Where the numbers come from, with the arithmetic. */
  basis: string;
  values: Record<string, unknown>;
}

export const displayPresets: readonly Preset[] = [
  {
    name: 'desktop-27in',
    summary: '27-inch 2560×1440 desktop monitor viewed from 70 cm',
    basis: 'typical 27" 16:9 panel: width 27·25.4·16/√337 = 597.7 mm, height 336.2 mm, pitch 0.2335 mm; 70 cm is a typical office distance; 250 cd/m² white, 1000:1 contrast',
    values: { kind: 'screen', diagonalIn: 27, resolutionPx: [2560, 1440], viewingDistanceMm: 700, peakLuminanceCdM2: 250, blackLuminanceCdM2: 0.25 },
  },
  {
    name: 'laptop-14in',
    summary: '14-inch 1920×1200 laptop viewed from 50 cm',
    basis: 'typical 14" 16:10 panel: width 14·25.4·16/√356 = 301.5 mm, height 188.5 mm; 50 cm typical laptop distance; 300 cd/m², 1000:1',
    values: { kind: 'screen', diagonalIn: 14, resolutionPx: [1920, 1200], viewingDistanceMm: 500, peakLuminanceCdM2: 300, blackLuminanceCdM2: 0.3 },
  },
  {
    name: 'phone-6in',
    summary: '6.1-inch 1170×2532 phone held at 35 cm',
    basis: 'typical 6.1" phone: width 6.1·25.4·1170/√(1170²+2532²) = 65.0 mm, height 140.6 mm (457 px/in); 35 cm typical reading distance; 500 cd/m², black 0.5 cd/m² from reflections',
    values: { kind: 'screen', diagonalIn: 6.1, resolutionPx: [1170, 2532], viewingDistanceMm: 350, peakLuminanceCdM2: 500, blackLuminanceCdM2: 0.5 },
  },
  {
    name: 'vehicle-cluster',
    summary: '12.3-inch 1920×720 instrument cluster at 80 cm',
    basis: 'typical 12.3" 8:3 cluster: width 12.3·25.4·8/√73 = 292.5 mm, height 109.7 mm; 80 cm eye-to-cluster distance typical for a seated driver; 600 cd/m², black 0.5 cd/m² in daylight',
    values: { kind: 'screen', diagonalIn: 12.3, resolutionPx: [1920, 720], viewingDistanceMm: 800, peakLuminanceCdM2: 600, blackLuminanceCdM2: 0.5 },
  },
  {
    name: 'headset-wide',
    summary: 'wide headset eye buffer: 1600×1600 px over 100°×100°, virtual image at 1.3 m',
    basis: 'typical consumer headset: 100° field over 1600 px gives 16 px/° averaged, (800/tan 50°)·π/180 = 11.7 px/° at the centre of a rectilinear buffer; 1.3 m virtual image; 100 cd/m² white after the lens',
    values: { kind: 'headset', resolutionPx: [1600, 1600], fieldOfViewDeg: [100, 100], focalDistanceM: 1.3, peakLuminanceCdM2: 100, blackLuminanceCdM2: 0.02 },
  },
  {
    name: 'headset-narrow',
    summary: 'narrow, sharp headset eye buffer: 1920×1920 px over 50°×50°, 40 mm lens',
    basis: 'typical high-resolution headset: (960/tan 25°)·π/180 = 35.9 px/° at the centre; thin lens f = 40 mm with the panel at 38 mm gives a virtual image at 38·40/(40−38) = 760 mm, plus 12 mm eye relief = 0.772 m; 200 cd/m² white, OLED black',
    values: {
      kind: 'headset', resolutionPx: [1920, 1920], fieldOfViewDeg: [50, 50],
      lens: { focalLengthMm: 40, screenDistanceMm: 38, eyeReliefMm: 12 }, peakLuminanceCdM2: 200, blackLuminanceCdM2: 0.005,
    },
  },
];

export const viewerPresets: readonly Preset[] = [
  {
    name: 'age-25',
    summary: '25-year-old, no refractive error, both eyes',
    basis: 'emmetropic young adult; accommodation 18.5 − 0.3·25 = 11 D (Hofstetter 1950, mean)',
    values: { ageYears: 25, refraction: { sphereD: 0, cylinderD: 0, axisDeg: 0 }, pupilDiameterMm: 'auto', eyes: 'both' },
  },
  {
    name: 'age-45',
    summary: '45-year-old, no refractive error, no reading glasses, both eyes',
    basis: 'early presbyopia; accommodation 18.5 − 0.3·45 = 5 D (Hofstetter 1950, mean)',
    values: { ageYears: 45, refraction: { sphereD: 0, cylinderD: 0, axisDeg: 0 }, pupilDiameterMm: 'auto', eyes: 'both' },
  },
  {
    name: 'age-55',
    summary: '55-year-old, no refractive error, no reading glasses, both eyes',
    basis: 'presbyopia; accommodation 18.5 − 0.3·55 = 2 D (Hofstetter 1950, mean)',
    values: { ageYears: 55, refraction: { sphereD: 0, cylinderD: 0, axisDeg: 0 }, pupilDiameterMm: 'auto', eyes: 'both' },
  },
  {
    name: 'age-70',
    summary: '70-year-old, no refractive error, no reading glasses, both eyes',
    basis: 'advanced presbyopia; accommodation max(0, 18.5 − 0.3·70) = 0 D (Hofstetter 1950, mean, floored)',
    values: { ageYears: 70, refraction: { sphereD: 0, cylinderD: 0, axisDeg: 0 }, pupilDiameterMm: 'auto', eyes: 'both' },
  },
  {
    name: 'age-70-corrected',
    summary: '70-year-old, no refractive error, wearing glasses for the display\'s distance, both eyes',
    basis: 'as age-70, with single-vision reading or computer glasses that put the display in focus (viewer.glasses "display")',
    values: { ageYears: 70, refraction: { sphereD: 0, cylinderD: 0, axisDeg: 0 }, pupilDiameterMm: 'auto', eyes: 'both', glasses: 'display' },
  },
  {
    name: 'myope-2d',
    summary: '30-year-old myope of −2 D without glasses, both eyes',
    basis: 'uncorrected −2 D: far point at 1/2 = 0.5 m, so anything farther is blurred; accommodation 18.5 − 0.3·30 = 9.5 D',
    values: { ageYears: 30, refraction: { sphereD: -2, cylinderD: 0, axisDeg: 0 }, pupilDiameterMm: 'auto', eyes: 'both' },
  },
];

export const defaultDisplayPreset = 'desktop-27in';
export const defaultViewerPreset = 'age-25';

export function findPreset(list: readonly Preset[], name: string): Preset | undefined {
  return list.find((p) => p.name === name);
}
