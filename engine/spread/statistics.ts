// The statistics of the spread analysis (docs/checks.md "Spread analysis"): Wilson score interval,
// sample quantiles, Spearman rank correlation.

/** z of a two-sided 95% normal interval, Φ⁻¹(0.975) (standard normal tables). */
export const Z95 = 1.959963984540054;

/**
 * Wilson score interval of a binomial proportion (Wilson, "Probable inference, the law of succession, and
 * statistical inference", JASA 22, 1927): centre (p̂ + z²/2n)/(1 + z²/n), half-width
 * z/(1 + z²/n)·√(p̂(1 − p̂)/n + z²/4n²). Unlike p̂ ± z√(p̂(1−p̂)/n) it stays inside [0, 1] and is not empty at 0 or n passes.
 *
 * @param passed - successes k
 * @param total - trials n (> 0)
 * @param z - normal quantile (default 95% two-sided)
 * @returns low and high bounds
 * @example wilsonInterval(75, 100) // { low: 0.657…, high: 0.824… }
 */
export function wilsonInterval(passed: number, total: number, z = Z95): { low: number; high: number } {
  if (!(total > 0)) return { low: 0, high: 1 };
  const p = passed / total;
  const z2 = z * z;
  const denom = 1 + z2 / total;
  const centre = (p + z2 / (2 * total)) / denom;
  const half = (z / denom) * Math.sqrt((p * (1 - p)) / total + z2 / (4 * total * total));
  // at 0 or n passes the bound is exactly 0 or 1; rounding would leave 1 − 2⁻⁵² there
  return { low: passed === 0 ? 0 : Math.max(0, centre - half), high: passed === total ? 1 : Math.min(1, centre + half) };
}

/**
 * Quantile of sorted values by linear interpolation between order statistics: h = (n − 1)·q,
 * x[⌊h⌋] + (h − ⌊h⌋)(x[⌊h⌋+1] − x[⌊h⌋]) (Hyndman and Fan, "Sample quantiles in statistical packages",
 * The American Statistician 50(4), 1996, definition 7; numpy's default).
 *
 * @param sorted - ascending values (length ≥ 1)
 * @param q - in [0, 1]
 * @example quantileSorted(Float64Array.of(1, 2, 3, 4), 0.5) // 2.5
 */
export function quantileSorted(sorted: ArrayLike<number>, q: number): number {
  const n = sorted.length;
  if (n === 1) return sorted[0];
  const h = (n - 1) * q;
  const lo = Math.floor(h);
  if (lo >= n - 1) return sorted[n - 1];
  return sorted[lo] + (h - lo) * (sorted[lo + 1] - sorted[lo]);
}

/** Ranks 1…n of the values, ties given the mean of the ranks they span. */
export function averageRanks(values: ArrayLike<number>): Float64Array {
  const n = values.length;
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => values[a] - values[b]);
  const ranks = new Float64Array(n);
  for (let i = 0; i < n; ) {
    let j = i + 1;
    while (j < n && values[order[j]] === values[order[i]]) j++;
    const r = (i + 1 + j) / 2;
    for (let k = i; k < j; k++) ranks[order[k]] = r;
    i = j;
  }
  return ranks;
}

/** Pearson correlation; null when either series is constant. */
function pearson(x: ArrayLike<number>, y: ArrayLike<number>): number | null {
  const n = x.length;
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    mx += x[i];
    my += y[i];
  }
  mx /= n;
  my /= n;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const dx = x[i] - mx;
    const dy = y[i] - my;
    sxy += dx * dy;
    sxx += dx * dx;
    syy += dy * dy;
  }
  if (sxx === 0 || syy === 0) return null;
  return sxy / Math.sqrt(sxx * syy);
}

/**
 * Spearman's rank correlation (Spearman, "The proof and measurement of association between two things",
 * Am. J. Psychol. 15, 1904): the Pearson correlation of the average ranks, so ties are handled exactly.
 *
 * @returns ρ in [−1, 1], or null when either series is constant (no ranking possible)
 * @example spearman([1, 2, 3], [10, 20, 25]) // 1
 */
export function spearman(x: ArrayLike<number>, y: ArrayLike<number>): number | null {
  if (x.length !== y.length) throw new RangeError("spearman: series of different lengths");
  if (x.length < 2) return null;
  return pearson(averageRanks(x), averageRanks(y));
}
