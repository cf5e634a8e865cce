/** The replaceable acuity models: each gives the finest resolvable frequency at a field location. */
import type { AcuityModelName, Eyes } from '../config/setup.js';
import { geislerPerryCutoffCpd } from './geisler-perry.js';
import { rgcNyquistCpd } from './watson-rgc.js';

export interface AcuityModel {
  name: AcuityModelName;
  summary: string;
  source: string;
  /** Finest resolvable frequency, cpd, at an eccentricity and field meridian (0 right, 90 up). */
  cutoffCpd(eccentricityDeg: number, meridianDeg: number, eyes: Eyes): number;
  /**
   * Share of the cutoff at which a sharp letter's 2.5 cycles per letter lie (src/analysis/letter-size.ts):
   * fitted so that a young eye's foveal letter is logMAR −0.16 (Elliott, Yang & Whitaker 1995) with
   * either model (scripts/fit-letter-rule.ts).
   */
  letterFactor: number;
  /** What distinguishes a derived model from its base (e.g. the neural factor of an age), for caches. */
  variant?: string;
}

export const acuityModels: Record<AcuityModelName, AcuityModel> = {
  'rgc-sampling': {
    name: 'rgc-sampling',
    summary: 'Nyquist frequency of one (ON or OFF) midget ganglion-cell lattice, per meridian',
    source: 'Watson (2014), J Vision 14(7):15',
    cutoffCpd: rgcNyquistCpd,
    letterFactor: 0.76,
  },
  'contrast-threshold': {
    name: 'contrast-threshold',
    summary: 'frequency where the eccentricity-dependent contrast threshold reaches 100 %',
    source: 'Geisler & Perry (1998), Proc SPIE 3299',
    cutoffCpd: (eccentricityDeg) => geislerPerryCutoffCpd(eccentricityDeg),
    letterFactor: 1.269,
  },
};
