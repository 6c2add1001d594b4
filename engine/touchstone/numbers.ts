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
