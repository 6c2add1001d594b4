/** A safe file name stem from a scenario name. */
export function fileStem(name: string): string {
  return name.trim().replace(/[^A-Za-z0-9._-]+/g, "_").replace(/^_+|_+$/g, "") || "scenario";
}
