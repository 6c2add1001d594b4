/**
 * Portolan's engine: the public API, re-exported from its modules. Pure TypeScript, usable from the
 * CLI, the route handlers and the browser. Two modules that need Node are not re-exported: the CLI
 * (engine/cli.ts, node:fs) and bundles (engine/bundle, node:zlib and node:crypto); import them directly.
 *
 * @example
 * import { parseScenario, solveScenario } from "@/engine";
 * const solution = solveScenario(parseScenario(json));
 */
export * from "./types";
export * from "./version";
export * from "./complex";
export * from "./linalg";
export * from "./renorm";
export * from "./interp";
export * from "./touchstone";
export * from "./blocks";
export * from "./network";
export * from "./scenario";
export * from "./system";
export * from "./noise";
export * from "./lineup";
export * from "./checks";
export * from "./spread";
// the interpolation and the checks both export a hertz formatter; the checks' one is the public one
export { formatHz } from "./checks";
export * from "./canonical-json";
