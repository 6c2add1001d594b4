/**
 * The stem of every file named after a scenario (composite downloads, the solve route, review bundles):
 * letters, digits and dashes, lower case, accents dropped, at most 60 characters, "scenario" when
 * nothing is left. Safe in a `content-disposition` header without quoting rules.
 * @example fileStem("Telemetry front end (S band)") // "telemetry-front-end-s-band"
 */
export function fileStem(name: string): string {
  return (
    name
      .normalize("NFKD")
      .replace(/[^\w\s-]/g, "")
      .trim()
      .replace(/[\s_]+/g, "-")
      .toLowerCase()
      .slice(0, 60) || "scenario"
  );
}
