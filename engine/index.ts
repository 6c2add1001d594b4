/**
 * Portolan's engine: the public API, re-exported from its modules. Pure TypeScript, usable from the
 * CLI, the route handlers and the browser (the CLI itself, engine/cli.ts, is not re-exported: it uses Node).
 *
 * @example
 * import { parseScenario, solveScenario } from "@/engine";
 * const solution = solveScenario(parseScenario(json));
 */
export * from "./types";
export * from "./complex";
export * from "./linalg";
export * from "./renorm";
export * from "./interp";
export * from "./touchstone";
export * from "./blocks";
export * from "./network";
export * from "./scenario";
export * from "./system";
export * from "./checks";
// the interpolation and the checks both export a hertz formatter; the checks' one is the public one
export { formatHz } from "./checks";
