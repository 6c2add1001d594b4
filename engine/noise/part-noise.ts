// The noise section of a touchstone part on the frequency plan.

import { interpolateS } from "../interp";
import type { NoiseRows } from "../touchstone/noise";
import { chainFromNoiseParameters } from "./noise-parameters";

/**
 * The chain correlation matrices of a part's noise parameters on the plan: each noise frequency's
 * (Fmin, Γopt, Rn) to its chain matrix, then linear interpolation of the matrices between noise frequencies
 * (the matrices, not the parameters, are interpolated, as scikit-rf 0.15.4 does), holding the end values
 * outside the noise data's range (with a warning: noise data often covers less than the S data).
 *
 * @param rows the part's noise section (TouchstoneData.noise)
 * @param plan plan frequencies, Hz
 * @param name the block id, for the warning
 * @returns chain: [k][2][2] interleaved (W/Hz), warnings
 * @example partNoiseOnPlan(part.noise, sys.frequencies, "LNA1").chain
 */
export function partNoiseOnPlan(rows: NoiseRows, plan: Float64Array, name: string): { chain: Float64Array; warnings: string[] } {
  const m = rows.frequencies.length;
  const data = new Float64Array(8 * m);
  for (let k = 0; k < m; k++) {
    chainFromNoiseParameters(
      { fmin: 10 ** (rows.fminDb[k] / 10), gammaOpt: [rows.gammaOpt[2 * k], rows.gammaOpt[2 * k + 1]], rn: rows.rn[k] },
      rows.referenceOhms,
      data.subarray(8 * k, 8 * k + 8),
    );
  }
  const { s, extrapolated } = interpolateS({ n: 2, nf: m, data }, rows.frequencies, plan, { name, extrapolate: "hold" });
  const warnings: string[] = [];
  if (extrapolated.below > 0 || extrapolated.above > 0) {
    warnings.push(`block ${name}: noise data covers ${rows.frequencies[0]} Hz to ${rows.frequencies[m - 1]} Hz; the noise parameters are held at the nearest end outside it (${extrapolated.below + extrapolated.above} plan points)`);
  }
  return { chain: s.data, warnings };
}
