/**
 * Zernike polynomials in the ANSI Z80.28 convention for eyes (Thibos, Applegate, Schwiegerling &
 * Webb 2002): Z_n^m = N·R_n^|m|(ρ)·cos(mθ) for m ≥ 0, N·R_n^|m|(ρ)·sin(|m|θ) for m < 0, with
 * N = sqrt(2(n+1)/(1+δ_m0)); single index j = (n(n+2)+m)/2. Each term has unit RMS over the pupil.
 */

export interface ZernikeTerm {
  n: number;
  m: number;
  /** Coefficient, µm of wavefront (RMS of the term). */
  coefficientUm: number;
  /**
   * For coefficients measured over a larger pupil: the term is evaluated at ρ·pupilScale, with
   * pupilScale = (pupil radius now) / (radius measured), ≤ 1.
   */
  pupilScale?: number;
}

/** Single index j from (n, m) (ANSI Z80.28). */
export function zernikeIndex(n: number, m: number): number {
  return (n * (n + 2) + m) / 2;
}

/** (n, m) from the single index j (ANSI Z80.28). */
export function zernikeOrders(j: number): { n: number; m: number } {
  const n = Math.ceil((-3 + Math.sqrt(9 + 8 * j)) / 2);
  return { n, m: 2 * j - n * (n + 2) };
}

function factorial(k: number): number {
  let f = 1;
  for (let i = 2; i <= k; i++) f *= i;
  return f;
}

/** Radial polynomial R_n^|m|(ρ). */
export function zernikeRadial(n: number, absM: number, rho: number): number {
  let sum = 0;
  for (let s = 0; s <= (n - absM) / 2; s++) {
    sum += ((-1) ** s * factorial(n - s)) / (factorial(s) * factorial((n + absM) / 2 - s) * factorial((n - absM) / 2 - s)) * rho ** (n - 2 * s);
  }
  return sum;
}

/** Z_n^m at polar pupil coordinates (ρ in 0…1, θ in radians, counter-clockwise from the x axis). */
export function zernike(n: number, m: number, rho: number, theta: number): number {
  const norm = Math.sqrt((2 * (n + 1)) / (m === 0 ? 2 : 1));
  const radial = zernikeRadial(n, Math.abs(m), rho);
  return norm * radial * (m > 0 ? Math.cos(m * theta) : m < 0 ? Math.sin(-m * theta) : 1);
}

/** Wavefront (µm) of a set of terms at a pupil point. */
export function wavefrontUm(terms: readonly ZernikeTerm[], rho: number, theta: number): number {
  let w = 0;
  for (const t of terms) w += t.coefficientUm * zernike(t.n, t.m, rho * (t.pupilScale ?? 1), theta);
  return w;
}

/**
 * The wavefront of a set of terms as a fast function of (ρ, θ): each radial polynomial is expanded
 * once into powers of ρ (the same values as `wavefrontUm`).
 */
export function compileWavefront(terms: readonly ZernikeTerm[]): (rho: number, theta: number) => number {
  const compiled = terms.filter((t) => t.coefficientUm !== 0).map((t) => {
    const absM = Math.abs(t.m);
    const powers: [number, number][] = [];
    for (let s = 0; s <= (t.n - absM) / 2; s++) {
      powers.push([((-1) ** s * factorial(t.n - s)) / (factorial(s) * factorial((t.n + absM) / 2 - s) * factorial((t.n - absM) / 2 - s)), t.n - 2 * s]);
    }
    const norm = Math.sqrt((2 * (t.n + 1)) / (t.m === 0 ? 2 : 1));
    return { scale: t.coefficientUm * norm, powers, m: t.m, pupilScale: t.pupilScale ?? 1 };
  });
  return (rho, theta) => {
    let w = 0;
    for (const c of compiled) {
      const r = rho * c.pupilScale;
      let radial = 0;
      for (const [k, p] of c.powers) radial += k * r ** p;
      w += c.scale * radial * (c.m > 0 ? Math.cos(c.m * theta) : c.m < 0 ? Math.sin(-c.m * theta) : 1);
    }
    return w;
  };
}
