// The noise-parameter lines of a 2-port Touchstone file (1.1: the lines after the frequency first decreases;
// 2.0: [Noise Data]), kept apart from read.ts so the reader only collects the numbers.

/**
 * 2-port noise parameters as a file gives them, one entry per noise frequency: minimum noise figure
 * (dB), optimum source reflection Γopt (referenced to `referenceOhms`) and the effective noise
 * resistance Rn in ohms (the file's value is normalised to the reference resistance, in 1.1 and 2.0 alike
 * — from memory of the specification).
 */
export type NoiseRows = {
  /** Hz, strictly increasing */
  frequencies: Float64Array;
  fminDb: Float64Array;
  /** Γopt interleaved re/im */
  gammaOpt: Float64Array;
  /** Ω */
  rn: Float64Array;
  /** the real reference resistance Γopt and Rn are normalised to (port 1's), Ω */
  referenceOhms: number;
};

/**
 * Rows of five numbers (frequency in the file's unit, Fmin dB, |Γopt|, ∠Γopt degrees, Rn/R) as NoiseRows.
 *
 * @param values the rows one after the other (length a multiple of 5; checked by the reader)
 * @param unitScale Hz per unit of the file's frequencies
 * @param referenceOhms port 1's reference resistance
 * @example noiseRowsOf([1, 0.5, 0.3, 45, 0.2], 1e9, 50).rn[0] // 10
 */
export function noiseRowsOf(values: number[], unitScale: number, referenceOhms: number): NoiseRows {
  const m = Math.floor(values.length / 5);
  const rows: NoiseRows = {
    frequencies: new Float64Array(m),
    fminDb: new Float64Array(m),
    gammaOpt: new Float64Array(2 * m),
    rn: new Float64Array(m),
    referenceOhms,
  };
  for (let k = 0; k < m; k++) {
    const [f, fmin, mag, deg, rn] = values.slice(5 * k, 5 * k + 5);
    rows.frequencies[k] = f * unitScale;
    rows.fminDb[k] = fmin;
    const th = (deg * Math.PI) / 180;
    rows.gammaOpt[2 * k] = mag * Math.cos(th);
    rows.gammaOpt[2 * k + 1] = mag * Math.sin(th);
    rows.rn[k] = rn * referenceOhms;
  }
  return rows;
}
