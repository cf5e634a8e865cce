/** The colour scale of maps: viridis (perceptually uniform, readable with colour-vision deficiencies). */
import { interpolateViridis } from 'd3-scale-chromatic';

let table: Uint8Array | undefined;

/** 256-entry RGB table of viridis, dark blue (0) to yellow (255). */
export function viridisTable(): Uint8Array {
  if (table) return table;
  table = new Uint8Array(256 * 3);
  for (let i = 0; i < 256; i++) {
    const hex = interpolateViridis(i / 255);
    table[i * 3] = parseInt(hex.slice(1, 3), 16);
    table[i * 3 + 1] = parseInt(hex.slice(3, 5), 16);
    table[i * 3 + 2] = parseInt(hex.slice(5, 7), 16);
  }
  return table;
}

/** A log scale from `min` to `max` mapped to 0…1. */
export function logScale(min: number, max: number): (v: number) => number {
  const lo = Math.log(min);
  const span = Math.log(max) - lo || 1;
  return (v) => Math.min(1, Math.max(0, (Math.log(v) - lo) / span));
}

/** Round values (1, 1.5, 2, 3, 4, 6, 8 × powers of ten) within [min, max], at most `count` of them. */
export function niceLogTicks(min: number, max: number, count: number): number[] {
  const steps = [1, 1.5, 2, 3, 4, 6, 8];
  const all: number[] = [];
  for (let p = Math.floor(Math.log10(min)) - 1; p <= Math.ceil(Math.log10(max)); p++) {
    for (const s of steps) {
      const v = s * 10 ** p;
      if (v >= min && v <= max) all.push(Number(v.toPrecision(3)));
    }
  }
  if (all.length <= count) return all;
  // Keep evenly spaced ticks in log terms.
  const out: number[] = [];
  for (let i = 0; i < count; i++) out.push(all[Math.round((i * (all.length - 1)) / (count - 1))]);
  return [...new Set(out)];
}
