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
}

export const acuityModels: Record<AcuityModelName, AcuityModel> = {
  'rgc-sampling': {
    name: 'rgc-sampling',
    summary: 'Nyquist frequency of one (ON or OFF) midget ganglion-cell lattice, per meridian',
    source: 'Watson (2014), J Vision 14(7):15',
    cutoffCpd: rgcNyquistCpd,
  },
  'contrast-threshold': {
    name: 'contrast-threshold',
    summary: 'frequency where the eccentricity-dependent contrast threshold reaches 100 %',
    source: 'Geisler & Perry (1998), Proc SPIE 3299',
    cutoffCpd: (eccentricityDeg) => geislerPerryCutoffCpd(eccentricityDeg),
  },
};
