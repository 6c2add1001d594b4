// Two-port noise parameters (Fmin, Γopt, Rn) and the two correlation matrices they are turned into: the chain
// form (a series noise voltage v and a shunt noise current i in front of a noiseless two-port; Hillbrand and
// Russer, 1976) and the noise-wave form of the interconnection (Wedge and Rutledge, 1992). Both references
// and the formulas below are from memory; the tests check them against scikit-rf 0.15.4's noisy networks.
//
// Units: one-sided spectral densities per hertz, so a matched resistor at T sends a wave of |a|² = kT (W/Hz)
// and its open-circuit voltage has <|v|²> = 4kTR. Chain form C_A = [<v v*> <v i*>; <i v*> <i i*>] with the
// chain convention V1 = V1' + v, I1 = I1' + i (V1', I1' at the noiseless two-port), under which
// F(Ys) = Fmin + (Rn/Gs)·|Ys − Yopt|² and
//   C_A = 4kT0·[ Rn, (Fmin − 1)/2 − Rn·Yopt* ; (Fmin − 1)/2 − Rn·Yopt, Rn·|Yopt|² ].

/** Boltzmann's constant, J/K (SI 2019, exact). */
export const BOLTZMANN = 1.380649e-23;
/** The standard noise temperature of noise figures, K. */
export const T0 = 290;

/** Fmin as a ratio (≥ 1), Γopt referenced to `z0` (interleaved pair), Rn in ohms. */
export type NoiseParameters = { fmin: number; gammaOpt: [number, number]; rn: number };

/**
 * The chain correlation matrix of a two-port's noise parameters.
 *
 * @param p Fmin (ratio), Γopt (referenced to z0), Rn (Ω)
 * @param z0 the real reference Γopt is given in, Ω
 * @param out 8 numbers, [v v*, v i*, i v*, i i*] interleaved re/im, W/Hz·(Ω or S as the entry needs)
 * @example chainFromNoiseParameters({ fmin: 1.5, gammaOpt: [0, 0], rn: 10 }, 50)
 */
export function chainFromNoiseParameters(p: NoiseParameters, z0: number, out: Float64Array = new Float64Array(8)): Float64Array {
  const [gr, gi] = p.gammaOpt;
  // Yopt = (1 − Γ)/(z0 (1 + Γ))
  const dr = z0 * (1 + gr);
  const di = z0 * gi;
  const d2 = dr * dr + di * di;
  const nr = 1 - gr;
  const ni = -gi;
  const yr = (nr * dr + ni * di) / d2;
  const yi = (ni * dr - nr * di) / d2;
  const k4 = 4 * BOLTZMANN * T0;
  const half = (p.fmin - 1) / 2;
  out[0] = k4 * p.rn;
  out[1] = 0;
  out[2] = k4 * (half - p.rn * yr);
  out[3] = k4 * p.rn * yi; // −Rn·conj(Yopt) has imaginary part +Rn·Im Yopt
  out[4] = out[2];
  out[5] = -out[3];
  out[6] = k4 * p.rn * (yr * yr + yi * yi);
  out[7] = 0;
  return out;
}

/**
 * Noise parameters of a chain correlation matrix (the inverse of chainFromNoiseParameters):
 * Rn = <|v|²>/4kT0, Ycor = <i v*>/<|v|²>, Gu = <|i|²>/4kT0 − Rn|Ycor|², Gopt = √(Gu/Rn + Gcor²),
 * Bopt = −Bcor, Fmin = 1 + 2Rn(Gcor + Gopt).
 *
 * @param ca 8 numbers as chainFromNoiseParameters writes them
 * @param z0 the reference for Γopt, Ω
 * @example noiseParametersFromChain(chainFromNoiseParameters(p, 50), 50) // ≈ p
 */
export function noiseParametersFromChain(ca: Float64Array, z0: number): NoiseParameters {
  const k4 = 4 * BOLTZMANN * T0;
  const rn = ca[0] / k4;
  // no noise voltage: F = 1 + Gu/Gs, least (1) towards an infinite source admittance
  if (!(rn > 0)) return { fmin: 1, gammaOpt: ca[6] > 0 ? [-1, 0] : [0, 0], rn: 0 };
  const cr = ca[4] / ca[0];
  const ci = ca[5] / ca[0];
  const gu = ca[6] / k4 - rn * (cr * cr + ci * ci);
  const gopt = Math.sqrt(Math.max(0, gu / rn + cr * cr));
  const yr = gopt;
  const yi = -ci;
  // Γopt = (1 − z0·Y)/(1 + z0·Y)
  const ar = 1 - z0 * yr;
  const ai = -z0 * yi;
  const br = 1 + z0 * yr;
  const bi = z0 * yi;
  const b2 = br * br + bi * bi;
  return { fmin: 1 + 2 * rn * (cr + gopt), gammaOpt: [(ar * br + ai * bi) / b2, (ai * br - ar * bi) / b2], rn };
}

// 2×2 complex helpers on 8-number arrays (row-major, interleaved)
function mul2(out: Float64Array, a: ArrayLike<number>, b: ArrayLike<number>): Float64Array {
  for (let i = 0; i < 2; i++) {
    for (let j = 0; j < 2; j++) {
      let re = 0;
      let im = 0;
      for (let k = 0; k < 2; k++) {
        const xr = a[2 * (2 * i + k)];
        const xi = a[2 * (2 * i + k) + 1];
        const yr = b[2 * (2 * k + j)];
        const yi = b[2 * (2 * k + j) + 1];
        re += xr * yr - xi * yi;
        im += xr * yi + xi * yr;
      }
      out[2 * (2 * i + j)] = re;
      out[2 * (2 * i + j) + 1] = im;
    }
  }
  return out;
}
function congruence(m: ArrayLike<number>, c: ArrayLike<number>): Float64Array {
  // m·c·mᴴ
  const mh = new Float64Array(8);
  for (let i = 0; i < 2; i++) {
    for (let j = 0; j < 2; j++) {
      mh[2 * (2 * i + j)] = m[2 * (2 * j + i)];
      mh[2 * (2 * i + j) + 1] = -m[2 * (2 * j + i) + 1];
    }
  }
  return mul2(new Float64Array(8), mul2(new Float64Array(8), m, c), mh);
}

/**
 * The noise-wave correlation matrix (outgoing waves of the two-port with both ports matched, W/Hz) of a
 * chain correlation matrix, given the two-port's S referenced to a real z0 at both ports. The chain
 * sources become two waves at port 1 of the noiseless two-port, a_n = −(v + z0·i)/(2√z0) travelling into
 * it and b_n = (v − z0·i)/(2√z0) travelling out, so the outgoing noise is c = [S11·a_n + b_n; S21·a_n].
 *
 * @param ca chain correlation (8 numbers)
 * @param s the two-port's S at this frequency (8 numbers, [S11, S12, S21, S22])
 * @param z0 the reference of `s`, Ω
 * @example waveFromChain(ca, s, 50) // [|c1|², c1 c2*, c2 c1*, |c2|²]
 */
export function waveFromChain(ca: ArrayLike<number>, s: ArrayLike<number>, z0: number): Float64Array {
  const r = Math.sqrt(z0);
  const h = 1 / (2 * r);
  const m = [-h, 0, -z0 * h, 0, h, 0, -z0 * h, 0];
  const n = [s[0], s[1], 1, 0, s[4], s[5], 0, 0];
  return congruence(n, congruence(m, ca));
}

/**
 * The chain correlation matrix of a two-port's noise-wave correlation matrix (inverse of waveFromChain);
 * needs S21 ≠ 0.
 *
 * @example noiseParametersFromChain(chainFromWave(c, s, 50), 50) // Fmin, Γopt, Rn of the two-port
 */
export function chainFromWave(cs: ArrayLike<number>, s: ArrayLike<number>, z0: number): Float64Array {
  // [a_n; b_n] = [[0, 1/S21], [1, −S11/S21]]·c
  const d = s[4] * s[4] + s[5] * s[5];
  const ir = s[4] / d;
  const ii = -s[5] / d;
  const qr = -(s[0] * ir - s[1] * ii);
  const qi = -(s[0] * ii + s[1] * ir);
  const nInv = [0, 0, ir, ii, 1, 0, qr, qi];
  // v = √z0·(b_n − a_n), i = −(a_n + b_n)/√z0
  const r = Math.sqrt(z0);
  const mInv = [-r, 0, r, 0, -1 / r, 0, -1 / r, 0];
  return congruence(mInv, congruence(nInv, cs));
}
