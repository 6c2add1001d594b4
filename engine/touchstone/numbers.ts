// Strict decimal number syntax for Touchstone data (Touchstone File Format Specification 2.0, IBIS Open Forum 2009,
// "numbers may be integers or floating point, with optional exponent" — from memory), checked in one linear pass.

/**
 * Parses one token as a finite decimal number: [+-] digits [. digits] [(e|E) [+-] digits], or [+-] . digits ….
 * Returns NaN when the token is not such a number or overflows (so "NaN", "Inf", "1e999", "0x10" all fail).
 *
 * @example
 * parseDecimal("-1.5e-3"); // -0.0015
 * parseDecimal("nan");     // NaN
 */
export function parseDecimal(tok: string): number {
  const len = tok.length;
  let i = 0;
  let c = tok.charCodeAt(0);
  if (c === 43 || c === 45) i++;
  let mantissaDigits = 0;
  while (i < len && isDigit(tok.charCodeAt(i))) {
    i++;
    mantissaDigits++;
  }
  if (i < len && tok.charCodeAt(i) === 46) {
    i++;
    while (i < len && isDigit(tok.charCodeAt(i))) {
      i++;
      mantissaDigits++;
    }
  }
  if (mantissaDigits === 0) return NaN;
  if (i < len) {
    c = tok.charCodeAt(i);
    if (c !== 101 && c !== 69) return NaN;
    i++;
    if (i < len && (tok.charCodeAt(i) === 43 || tok.charCodeAt(i) === 45)) i++;
    let expDigits = 0;
    while (i < len && isDigit(tok.charCodeAt(i))) {
      i++;
      expDigits++;
    }
    if (expDigits === 0 || i !== len) return NaN;
  }
  const v = Number(tok);
  return Number.isFinite(v) ? v : NaN;
}

function isDigit(c: number): boolean {
  return c >= 48 && c <= 57;
}

/**
 * Prints a number with `digits` significant digits, without trailing zeros ("0.5", "1.25e-7", "-3").
 *
 * @example
 * formatSignificant(0.5, 12);        // "0.5"
 * formatSignificant(1 / 3, 4);       // "0.3333"
 */
export function formatSignificant(x: number, digits: number): string {
  if (x === 0) return "0";
  return trimZeros(x.toPrecision(digits));
}

/**
 * Prints a number with `decimals` digits after the point, without trailing zeros ("-3.0103", "90").
 *
 * @example
 * formatFixed(-3.010299956639812, 6); // "-3.0103"
 */
export function formatFixed(x: number, decimals: number): string {
  const t = trimZeros(x.toFixed(decimals));
  return t === "-0" ? "0" : t;
}

function trimZeros(t: string): string {
  const e = t.search(/[eE]/);
  let mant = e < 0 ? t : t.slice(0, e);
  const exp = e < 0 ? "" : t.slice(e);
  if (mant.includes(".")) {
    let end = mant.length;
    while (end > 0 && mant.charCodeAt(end - 1) === 48) end--;
    if (end > 0 && mant.charCodeAt(end - 1) === 46) end--;
    mant = mant.slice(0, end);
  }
  if (mant === "-0") mant = "0";
  return mant + exp;
}

/** A decimal token split into its sign, significant digits (no leading or trailing zeros) and exponent: value = ±0.digits × 10^exp. */
type DecimalParts = { negative: boolean; digits: string; exp: number };

// Exponents beyond this give 0 or Infinity for any mantissa a 20 MB file can hold, so they are clamped to keep
// the shifted text an ordinary integer (no "1e+21" forms inside it).
const EXPONENT_CLAMP = 1e9;

function decimalParts(tok: string): DecimalParts {
  let i = 0;
  const negative = tok.charCodeAt(0) === 45;
  if (negative || tok.charCodeAt(0) === 43) i = 1;
  const e = tok.search(/[eE]/);
  const mantissa = tok.slice(i, e < 0 ? tok.length : e);
  let exp = e < 0 ? 0 : Number(tok.slice(e + 1));
  if (!Number.isFinite(exp) || Math.abs(exp) > EXPONENT_CLAMP) exp = Math.sign(exp) * EXPONENT_CLAMP;
  const dot = mantissa.indexOf(".");
  const intPart = dot < 0 ? mantissa : mantissa.slice(0, dot);
  const fracPart = dot < 0 ? "" : mantissa.slice(dot + 1);
  let all = intPart + fracPart;
  // value = 0.all × 10^(exp + intPart.length)
  let point = exp + intPart.length;
  let lead = 0;
  while (lead < all.length && all.charCodeAt(lead) === 48) lead++;
  let end = all.length;
  while (end > lead && all.charCodeAt(end - 1) === 48) end--;
  all = all.slice(lead, end);
  point -= lead;
  return { negative, digits: all, exp: all === "" ? 0 : point };
}

/**
 * The value of a decimal token times 10^shift, rounded once to the nearest double: the exponent of the text is
 * shifted and the shifted text converted by Number() (ECMA-262 StringToNumber, correctly rounded), so that
 * "4.1" GHz is exactly the double nearest 4 100 000 000, where 4.1 × 1e9 lands one ulp away.
 * The token must be a valid decimal (see parseDecimal). May return ±Infinity (overflow) or 0 (underflow).
 *
 * @example
 * scaleDecimal("4.1", 9);     // 4100000000
 * scaleDecimal("2.14", 9);    // 2140000000 (2.14 * 1e9 gives 2140000000.0000002)
 * scaleDecimal("1e300", 9);   // Infinity
 */
export function scaleDecimal(tok: string, shift: number): number {
  const fast = scaleDecimalFast(tok, shift);
  if (!Number.isNaN(fast)) return fast;
  const { negative, digits, exp } = decimalParts(tok);
  if (digits === "") return negative ? -0 : 0;
  const e = Math.max(-EXPONENT_CLAMP, Math.min(EXPONENT_CLAMP, exp + shift - digits.length));
  return Number(`${negative ? "-" : ""}${digits}e${e}`);
}

// Powers of ten that are exact doubles (10^22 < 2^53 · 2^22, the last with an exact binary64 form).
const EXACT_POW10 = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

/**
 * Clinger's fast path (W. D. Clinger, "How to read floating point numbers accurately", PLDI 1990): when the
 * significant digits form an integer D < 2^53 and the decimal exponent e satisfies |e| ≤ 22, both D and 10^|e|
 * are exact doubles, so the one IEEE multiplication or division D·10^e rounds correctly. NaN when the token
 * falls outside that case (more than 15 significant digits, or a larger exponent); the caller then takes the
 * exact string route.
 */
function scaleDecimalFast(tok: string, shift: number): number {
  const len = tok.length;
  let i = 0;
  let c = tok.charCodeAt(0);
  const negative = c === 45;
  if (negative || c === 43) i++;
  let d = 0;
  let sig = 0; // significant digits taken into d (leading zeros excluded)
  let frac = 0; // digits after the point taken into d
  let seenPoint = false;
  for (; i < len; i++) {
    c = tok.charCodeAt(i);
    if (c === 46) {
      seenPoint = true;
      continue;
    }
    if (c < 48 || c > 57) break;
    if (d === 0 && c === 48) {
      if (seenPoint) frac++;
      continue;
    }
    if (++sig > 15) return NaN;
    d = d * 10 + (c - 48);
    if (seenPoint) frac++;
  }
  let exp = 0;
  if (i < len) {
    // exponent: the token is a valid decimal, so (e|E)[+-]digits follows
    i++;
    let expNeg = false;
    c = tok.charCodeAt(i);
    if (c === 43 || c === 45) {
      expNeg = c === 45;
      i++;
    }
    for (; i < len; i++) {
      exp = exp * 10 + (tok.charCodeAt(i) - 48);
      if (exp > 1000) return NaN;
    }
    if (expNeg) exp = -exp;
  }
  if (d === 0) return negative ? -0 : 0;
  const e = exp + shift - frac;
  if (e > 22 || e < -22) return NaN;
  const v = e >= 0 ? d * EXACT_POW10[e] : d / EXACT_POW10[-e];
  return negative ? -v : v;
}

/**
 * Compares the exact values of two decimal tokens (no rounding): −1, 0 or 1. Tells apart texts such as
 * "1.00000000000000001" and "1.00000000000000002" that parse to the same double.
 *
 * @example
 * compareDecimal("1.00000000000000002", "1.00000000000000001"); // 1
 * compareDecimal("2.50", "25e-1");                               // 0
 */
export function compareDecimal(a: string, b: string): -1 | 0 | 1 {
  const x = decimalParts(a);
  const y = decimalParts(b);
  const sx = x.digits === "" ? 0 : x.negative ? -1 : 1;
  const sy = y.digits === "" ? 0 : y.negative ? -1 : 1;
  if (sx !== sy) return sx < sy ? -1 : 1;
  if (sx === 0) return 0;
  let c: number;
  if (x.exp !== y.exp) c = x.exp < y.exp ? -1 : 1;
  else c = x.digits < y.digits ? -1 : x.digits > y.digits ? 1 : 0; // same length of integer part: compare digit strings
  return (sx < 0 ? -c : c) as -1 | 0 | 1;
}
