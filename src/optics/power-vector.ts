/**
 * Power vectors and second-order Zernike terms, Thibos, Hong, Bradley & Applegate (2004),
 * J Vision 4(4):9: M = −4√3·c₂⁰/r², J0 = −2√6·c₂²/r², J45 = −2√6·c₂⁻²/r² (c in µm, r pupil radius
 * in mm, powers in D). Sphere/cylinder: M = S + C/2, J0 = −(C/2)·cos 2α, J45 = −(C/2)·sin 2α.
 */
import type { ZernikeTerm } from './zernike.js';

export interface PowerVector {
  /** Spherical equivalent, D (+ hyperopic). */
  mD: number;
  j0D: number;
  j45D: number;
}

export function powerVectorFromPrescription(sphereD: number, cylinderD: number, axisDeg: number): PowerVector {
  const a = (2 * axisDeg * Math.PI) / 180;
  return { mD: sphereD + cylinderD / 2, j0D: (-cylinderD / 2) * Math.cos(a), j45D: (-cylinderD / 2) * Math.sin(a) };
}

/** Back to sphere, (negative) cylinder and axis: C = −2·sqrt(J0² + J45²), S = M − C/2, α = ½·atan2(J45, J0). */
export function prescriptionFromPowerVector(p: PowerVector): { sphereD: number; cylinderD: number; axisDeg: number } {
  const cylinderD = -2 * Math.hypot(p.j0D, p.j45D);
  let axisDeg = ((0.5 * Math.atan2(p.j45D, p.j0D)) * 180) / Math.PI;
  if (axisDeg < 0) axisDeg += 180;
  return { sphereD: p.mD - cylinderD / 2, cylinderD, axisDeg };
}

/** Second-order Zernike coefficients (µm) of a refractive error over a pupil of radius r (mm). */
export function zernikeFromPowerVector(p: PowerVector, pupilRadiusMm: number): ZernikeTerm[] {
  const r2 = pupilRadiusMm * pupilRadiusMm;
  return [
    { n: 2, m: 0, coefficientUm: (-p.mD * r2) / (4 * Math.sqrt(3)) },
    { n: 2, m: 2, coefficientUm: (-p.j0D * r2) / (2 * Math.sqrt(6)) },
    { n: 2, m: -2, coefficientUm: (-p.j45D * r2) / (2 * Math.sqrt(6)) },
  ];
}

/** Spherical equivalent (D) of a defocus coefficient c₂⁰ (µm) over a pupil of radius r (mm). */
export function defocusDiopters(c20Um: number, pupilRadiusMm: number): number {
  return (-4 * Math.sqrt(3) * c20Um) / (pupilRadiusMm * pupilRadiusMm);
}
