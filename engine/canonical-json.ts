// JSON Canonicalization Scheme (RFC 8785, Rundgren, Jordan and Erdtman, 2020), §3.2: no whitespace,
// literals as in JSON, strings escaped as ECMAScript's JSON.stringify does (§3.2.2.2), numbers as
// ECMAScript Number::toString (§3.2.2.3), object members sorted by their names' UTF-16 code units
// (§3.2.3), applied recursively.

/** A value that has no canonical JSON form (RFC 8785 refuses it); `path` is a JSON path such as `$.blocks[2].name`. */
export class CanonicalJsonError extends Error {
  readonly path: string;
  constructor(path: string, message: string) {
    super(`${path}: ${message}`);
    this.name = "CanonicalJsonError";
    this.path = path;
  }
}

/**
 * The canonical JSON text of a value (RFC 8785 JSON Canonicalization Scheme): equal JSON data gives equal
 * text, so a hash of the text identifies the data. This is what scenario revision content hashes (and so
 * sign-offs) and bundle manifests are computed over.
 *
 * Input is a JSON-like JavaScript value: null, booleans, finite numbers, strings, arrays and plain
 * objects. As JSON.stringify does, object members whose value is `undefined` are left out and an
 * `undefined` array element is written as null; `toJSON` is honoured (a Date becomes its ISO string).
 * Refused with CanonicalJsonError (RFC 8785 §3.2.2.3 and §3.2.2.2): NaN and ±Infinity, strings (values or
 * member names) holding a lone UTF-16 surrogate, bigint, functions and symbols.
 *
 * @param value - the data
 * @returns canonical JSON text (no whitespace, members sorted by UTF-16 code units)
 * @throws CanonicalJsonError naming the JSON path of the first value that has no canonical form
 * @example
 * canonicalJson({ b: 1, a: [2, { d: 3, c: 4 }] }); // '{"a":[2,{"c":4,"d":3}],"b":1}'
 * canonicalJson({ n: [1e30, 4.5, 0.002] }); // '{"n":[1e+30,4.5,0.002]}'
 */
export function canonicalJson(value: unknown): string {
  const parts: string[] = [];
  write(value, "$", parts);
  return parts.join("");
}

// A lone surrogate: a high surrogate not followed by a low one, or a low one not preceded by a high one.
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

function writeString(s: string, path: string, parts: string[]): void {
  if (LONE_SURROGATE.test(s)) throw new CanonicalJsonError(path, "string holds a lone UTF-16 surrogate, which has no canonical JSON form (RFC 8785 §3.2.2.2)");
  // JSON.stringify escapes exactly as §3.2.2.2 asks: \b \t \n \f \r \" \\, other controls as \u00xx (lower-case hex)
  parts.push(JSON.stringify(s));
}

function write(value: unknown, path: string, parts: string[]): void {
  if (value !== null && typeof value === "object" && typeof (value as { toJSON?: unknown }).toJSON === "function") {
    value = (value as { toJSON: (key: string) => unknown }).toJSON("");
  }
  if (value === null) {
    parts.push("null");
    return;
  }
  switch (typeof value) {
    case "boolean":
      parts.push(value ? "true" : "false");
      return;
    case "number":
      if (!Number.isFinite(value)) throw new CanonicalJsonError(path, `${value} is not a JSON number (RFC 8785 §3.2.2.3)`);
      // Number::toString, which JSON.stringify also uses for finite numbers; −0 becomes "0"
      parts.push(JSON.stringify(value));
      return;
    case "string":
      writeString(value, path, parts);
      return;
    case "object":
      break;
    default:
      throw new CanonicalJsonError(path, `a ${typeof value} is not JSON data`);
  }
  if (Array.isArray(value)) {
    parts.push("[");
    for (let i = 0; i < value.length; i++) {
      if (i > 0) parts.push(",");
      const item: unknown = value[i];
      if (item === undefined) parts.push("null");
      else write(item, `${path}[${i}]`, parts);
    }
    parts.push("]");
    return;
  }
  // String comparison with < is by UTF-16 code units, the order §3.2.3 asks for (not code points).
  const keys = Object.keys(value as Record<string, unknown>)
    .filter((k) => (value as Record<string, unknown>)[k] !== undefined)
    .sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  parts.push("{");
  keys.forEach((k, i) => {
    if (i > 0) parts.push(",");
    const at = /^[A-Za-z_$][\w$]*$/.test(k) ? `${path}.${k}` : `${path}[${JSON.stringify(k)}]`;
    writeString(k, at, parts);
    parts.push(":");
    write((value as Record<string, unknown>)[k], at, parts);
  });
  parts.push("}");
}
