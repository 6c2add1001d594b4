// Seeded, reproducible random numbers for the spread analysis: xoshiro128** (Blackman and Vigna,
// "Scrambled linear pseudorandom number generators", ACM TOMS 47(4), 2021; reference code at
// prng.di.unimi.it), its state filled from the seed by SplitMix64 (Steele, Lea and Flood, "Fast splittable
// pseudorandom number generators", OOPSLA 2014), as the xoshiro authors recommend. Normal samples by
// Marsaglia's polar method (Marsaglia and Bray, "A convenient method for generating normal variables",
// SIAM Review 6(3), 1964).

const MASK64 = (1n << 64n) - 1n;

/** SplitMix64's outputs from a seed, as 32-bit halves (high then low). */
function splitMix64Words(seed: bigint, count: number): number[] {
  let x = seed & MASK64;
  const out: number[] = [];
  while (out.length < count) {
    x = (x + 0x9e3779b97f4a7c15n) & MASK64;
    let z = x;
    z = ((z ^ (z >> 30n)) * 0xbf58476d1ce4e5b9n) & MASK64;
    z = ((z ^ (z >> 27n)) * 0x94d049bb133111ebn) & MASK64;
    z = z ^ (z >> 31n);
    out.push(Number(z >> 32n), Number(z & 0xffffffffn));
  }
  return out.slice(0, count);
}

/** A seeded generator: uniform and normal doubles, the same sequence for the same seed. */
export type Random = {
  /** next 32-bit output of xoshiro128**, as an unsigned integer */
  nextUint32: () => number;
  /** uniform on [0, 1) with 53 random bits */
  uniform: () => number;
  /** standard normal (mean 0, standard deviation 1) */
  normal: () => number;
};

/**
 * xoshiro128** seeded through SplitMix64.
 *
 * @param seed - any safe integer (negative seeds are taken modulo 2⁶⁴)
 * @returns the generator
 * @example const r = createRandom(42); r.uniform(); // the same value on every run
 */
export function createRandom(seed: number): Random {
  if (!Number.isSafeInteger(seed)) throw new RangeError(`seed must be a safe integer, got ${seed}`);
  const [a0, a1, a2, a3] = splitMix64Words(BigInt(seed), 4);
  const s = Uint32Array.of(a0, a1, a2, a3);
  // an all-zero state would stay zero; SplitMix64 cannot give four zero words, but keep the guard explicit
  if ((s[0] | s[1] | s[2] | s[3]) === 0) s[0] = 1;
  const rotl = (x: number, k: number) => (x << k) | (x >>> (32 - k));
  const nextUint32 = (): number => {
    const result = Math.imul(rotl(Math.imul(s[1], 5), 7), 9) >>> 0;
    const t = s[1] << 9;
    s[2] ^= s[0];
    s[3] ^= s[1];
    s[1] ^= s[2];
    s[0] ^= s[3];
    s[2] ^= t;
    s[3] = rotl(s[3], 11);
    return result;
  };
  const uniform = (): number => {
    // 27 + 26 bits, the usual 53-bit construction of a double on [0, 1) (common practice)
    const hi = nextUint32() >>> 5;
    const lo = nextUint32() >>> 6;
    return (hi * 67108864 + lo) / 9007199254740992;
  };
  let spare: number | null = null;
  const normal = (): number => {
    if (spare !== null) {
      const v = spare;
      spare = null;
      return v;
    }
    let u: number;
    let v: number;
    let q: number;
    do {
      u = 2 * uniform() - 1;
      v = 2 * uniform() - 1;
      q = u * u + v * v;
    } while (q >= 1 || q === 0);
    const f = Math.sqrt((-2 * Math.log(q)) / q);
    spare = v * f;
    return u * f;
  };
  return { nextUint32, uniform, normal };
}
