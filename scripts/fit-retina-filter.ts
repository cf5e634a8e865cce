/**
 * Fits the coefficient table of the retina's sharp low-pass (src/retina/sharp-lowpass.ts) and writes
 * src/retina/sharp-lowpass-table.ts. Run with `npx tsx scripts/fit-retina-filter.ts`; the output is committed, so the
 * fit runs only when the filter design changes.
 *
 * The filter is a per-pixel linear combination of a half-octave ladder of blurs built from a
 * binomial pyramid: element n = 2k + family is pyramid level k (family 0) or level k further blurred
 * by a 5-tap binomial at its own resolution (family 1); its variance is 2^n − 1 px². Their 1-D
 * transfers (without aliasing) are
 *   E_k(f) = Π_{j<k} W(2^j f)²,  W(f) = cos⁶(πf) (7-tap binomial reduce and expand),
 *   Ẽ_k(f) = E_k(f) · cos⁴(π·2^k f),
 * with f in cycles per frame pixel. For a local cutoff f_c the coefficients come from tables indexed by
 * δ = log2(f_c) + k (the cutoff in cycles per level-k pixel), one table per family for level 0, for
 * level 1 and for all coarser levels (which are self-similar). They are fitted by least squares, with a
 * smoothness penalty, so that Σ coefficients × transfers matches the target
 *   T(x) = exp(−ln(20)·x⁴),  x = f / f_c:
 * 5 % at the cutoff (where the acuity model puts the limit), 0.83 at half of it (our proposal: a
 * sampling limit passes what lies well below it).
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';

const TARGET_EXPONENT = 4;
const RESPONSE_AT_CUTOFF = 0.05;
export const DELTA_MIN = -4;
export const DELTA_MAX = 3;
export const DELTA_STEP = 1 / 8;
const LEVELS = 12;
const TABLE_SETS = 3; // level 0, level 1, levels ≥ 2
const SMOOTHNESS = 0.05;
const RIDGE = 1e-3;

const reduceTransfer = (f: number): number => Math.cos(Math.PI * f) ** 6;
const extraBlurTransfer = (f: number): number => Math.cos(Math.PI * f) ** 4;
const levelTransfer = (k: number, f: number): number => {
  let r = 1;
  for (let j = 0; j < k; j++) r *= reduceTransfer(2 ** j * f) ** 2;
  return r;
};
const target = (x: number): number => Math.exp(Math.log(RESPONSE_AT_CUTOFF) * x ** TARGET_EXPONENT);

const nodes = Math.round((DELTA_MAX - DELTA_MIN) / DELTA_STEP) + 1;
const unknowns = TABLE_SETS * 2 * nodes;
const unknownIndex = (k: number, family: number, node: number): number => (Math.min(k, TABLE_SETS - 1) * 2 + family) * nodes + node;

/** Node index and linear weights for δ; outside the table the coefficient is 0. */
function nodeWeights(delta: number): [number, number, number] | undefined {
  if (delta <= DELTA_MIN || delta >= DELTA_MAX) return undefined;
  const t = (delta - DELTA_MIN) / DELTA_STEP;
  const i = Math.floor(t);
  return [i, 1 - (t - i), t - i];
}

const normal = Array.from({ length: unknowns }, () => new Float64Array(unknowns));
const rhs = new Float64Array(unknowns);
const frequencies = [0, ...Array.from({ length: 140 }, (_, i) => 0.0004 * 1.06 ** i).filter((f) => f <= 0.5)];
for (let lc = Math.log2(0.003); lc <= Math.log2(0.5) + 1e-9; lc += 1 / 16) {
  const fc = 2 ** lc;
  for (const f of frequencies) {
    const row = new Map<number, number>();
    for (let k = 0; k < LEVELS; k++) {
      const nw = nodeWeights(lc + k);
      if (!nw) continue;
      const e = levelTransfer(k, f);
      const transfers = [e, e * extraBlurTransfer(2 ** k * f)];
      for (let family = 0; family < 2; family++) {
        const add = (node: number, w: number): void => {
          const j = unknownIndex(k, family, node);
          row.set(j, (row.get(j) ?? 0) + w * transfers[family]);
        };
        add(nw[0], nw[1]);
        if (nw[2] > 0) add(nw[0] + 1, nw[2]);
      }
    }
    // The mean (f = 0) must be kept: weigh it heavily.
    const weight = f === 0 ? 30 : 1;
    const t = target(f / fc);
    const entries = [...row.entries()].filter(([, v]) => v !== 0);
    for (const [i, vi] of entries) {
      rhs[i] += weight * vi * t;
      for (const [j, vj] of entries) normal[i][j] += weight * vi * vj;
    }
  }
}
for (let s = 0; s < TABLE_SETS * 2; s++) {
  for (let i = 1; i < nodes - 1; i++) {
    const at = [s * nodes + i - 1, s * nodes + i, s * nodes + i + 1];
    const second = [1, -2, 1];
    for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) normal[at[a]][at[b]] += SMOOTHNESS * second[a] * second[b];
  }
}
for (let i = 0; i < unknowns; i++) normal[i][i] += RIDGE;

// Gaussian elimination with partial pivoting.
const m = normal.map((row, i) => Float64Array.from([...row, rhs[i]]));
for (let i = 0; i < unknowns; i++) {
  let p = i;
  for (let r = i + 1; r < unknowns; r++) if (Math.abs(m[r][i]) > Math.abs(m[p][i])) p = r;
  [m[i], m[p]] = [m[p], m[i]];
  for (let r = 0; r < unknowns; r++) {
    if (r === i || m[r][i] === 0) continue;
    const g = m[r][i] / m[i][i];
    for (let c = i; c <= unknowns; c++) m[r][c] -= g * m[i][c];
  }
}
const solution = Array.from({ length: unknowns }, (_, i) => m[i][unknowns] / m[i][i]);

const fmt = (values: number[]): string => values.map((v) => (Math.abs(v) < 5e-7 ? '0' : v.toPrecision(6))).join(', ');
const tables = Array.from({ length: TABLE_SETS * 2 }, (_, s) => solution.slice(s * nodes, (s + 1) * nodes));
const text = `/**
 * Coefficients of the retina's sharp low-pass, generated by scripts/fit-retina-filter.ts (do not edit;
 * run \`npx tsx scripts/fit-retina-filter.ts\`). Tables over δ = log2(cutoff in cycles per level-k pixel), from
 * ${DELTA_MIN} to ${DELTA_MAX} in steps of ${DELTA_STEP}; zero outside. Row s·2 + family: s = 0 for level 0,
 * 1 for level 1, 2 for every coarser level; family 0 is the pyramid level, family 1 the level blurred
 * once more by a 5-tap binomial. Target: exp(ln(${RESPONSE_AT_CUTOFF})·(f/f_c)^${TARGET_EXPONENT}).
 */
export const SHARP_DELTA_MIN = ${DELTA_MIN};
export const SHARP_DELTA_STEP = ${DELTA_STEP};
export const SHARP_TABLE_NODES = ${nodes};
export const SHARP_TARGET_EXPONENT = ${TARGET_EXPONENT};
export const SHARP_TABLES: readonly Float64Array[] = [
${tables.map((t) => `  Float64Array.from([${fmt(t)}]),`).join('\n')}
];
`;
const out = join(import.meta.dirname, '..', 'src', 'retina', 'sharp-lowpass-table.ts');
writeFileSync(out, text);
process.stdout.write(`wrote ${out}\n`);
