/**
 * JSON paths for error messages: `blocks[2].params.loss_db`, `links[3][1]`.
 */

/**
 * Formats a path of keys and indices the way a person reads it in a JSON file.
 *
 * @param path - keys (object members) and numbers (array indices), outermost first
 * @returns the dotted/bracketed path; "(root)" for an empty path
 * @example
 * formatJsonPath(["blocks", 2, "params", "loss_db"]); // "blocks[2].params.loss_db"
 */
export function formatJsonPath(path: readonly PropertyKey[]): string {
  let out = "";
  for (const key of path) {
    if (typeof key === "number") {
      out += `[${key}]`;
      continue;
    }
    const name = String(key);
    if (/^[A-Za-z_$][\w$-]*$/.test(name)) out += out === "" ? name : `.${name}`;
    else out += `[${JSON.stringify(name)}]`;
  }
  return out === "" ? "(root)" : out;
}
