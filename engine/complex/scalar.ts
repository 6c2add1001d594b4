// Overflow-safe complex modulus (hypot-style scaling) and complex division by Smith's algorithm
// (R. L. Smith, "Algorithm 116: Complex division", Communications of the ACM 5(8), 1962).

/**
 * Modulus |re + j·im| without overflow or underflow in the intermediate squares.
 *
 * @param re real part
 * @param im imaginary part
 * @returns |z| (same unit as the inputs)
 * @example cabs(3, 4) // 5; cabs(1e300, 1e300) // 1.414e300, not Infinity
 */
export function cabs(re: number, im: number): number {
  const x = Math.abs(re);
  const y = Math.abs(im);
  const big = x > y ? x : y;
  const small = x > y ? y : x;
  if (big === 0 || big === Infinity) return big + small; // +0, Infinity, or NaN propagates
  const r = small / big;
  return big * Math.sqrt(1 + r * r);
}

/**
 * Squared modulus |z|² (no scaling: use for power sums where the values are known to be moderate).
 *
 * @example cabs2(3, 4) // 25
 */
export function cabs2(re: number, im: number): number {
  return re * re + im * im;
}

/**
 * Complex division (ar + j·ai) / (br + j·bi) by Smith's algorithm, written to out[o], out[o + 1].
 * Division by exactly zero gives non-finite values; callers that must not produce NaN check the
 * divisor first.
 *
 * @param out destination array (interleaved re/im); may be any of the arrays the operands came from
 * @param o index of the real part of the result in `out`
 * @returns out
 * @example const q = cdiv(new Float64Array(2), 0, 1, 0, 0, 1); // q = [0, -1]  (1 / j = −j)
 */
export function cdiv(out: Float64Array, o: number, ar: number, ai: number, br: number, bi: number): Float64Array {
  if (Math.abs(br) >= Math.abs(bi)) {
    const r = bi / br;
    const d = br + bi * r;
    out[o] = (ar + ai * r) / d;
    out[o + 1] = (ai - ar * r) / d;
  } else {
    const r = br / bi;
    const d = bi + br * r;
    out[o] = (ar * r + ai) / d;
    out[o + 1] = (ai * r - ar) / d;
  }
  return out;
}

/**
 * Complex product (ar + j·ai)(br + j·bi), written to out[o], out[o + 1]. Safe when `out` holds an operand.
 *
 * @example cmul(new Float64Array(2), 0, 0, 1, 0, 1) // [-1, 0]  (j·j = −1)
 */
export function cmul(out: Float64Array, o: number, ar: number, ai: number, br: number, bi: number): Float64Array {
  const re = ar * br - ai * bi;
  const im = ar * bi + ai * br;
  out[o] = re;
  out[o + 1] = im;
  return out;
}
