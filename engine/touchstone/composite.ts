// The composite of a solved scenario as a Touchstone file: the one layout the CLI, the solve route, review
// bundles and the browser download all write (Touchstone File Format Specification 2.0, IBIS Open Forum, 2009).
import type { SData } from "../types";
import { writeTouchstone } from "./write";

/** What the writer needs of a composite: a Solution has all of it, so has the browser's solved view. */
export type CompositeData = {
  /** Hz, increasing */
  frequencies: Float64Array;
  /** composite S, n = ports.length, each port referenced to its own Z0 */
  s: SData;
  /** system port names, in order */
  ports: string[];
  /** each system port's Z0, Ω (real) */
  portZ0: number[];
  /** written as "warning:" comment lines when given */
  warnings?: string[];
};

export type CompositeWriteOptions = {
  /** the scenario's name, in the first comment line */
  scenarioName: string;
  /** significant digits of the RI values (default 12; bundles write 17 so that reading back gives the solved doubles) */
  digits?: number;
};

/**
 * The composite S-parameters as Touchstone text: RI, frequencies in Hz; version 1.1 when every system port
 * has the same Z0, else version 2.0 with [Reference]. Comment lines name the scenario, each port with its
 * Z0, and the solve's warnings.
 *
 * @param composite - frequencies, S, port names and Z0s (a Solution fits)
 * @param opts - scenario name for the header, digits
 * @returns the file text; its name should end .sNp with N = ports.length
 * @throws TouchstoneError when the data cannot be written (non-finite values, shapes that disagree)
 * @example
 * writeFileSync("front-end.s3p", writeCompositeTouchstone(solution, { scenarioName: solution.system.scenario.name }));
 */
export function writeCompositeTouchstone(composite: CompositeData, opts: CompositeWriteOptions): string {
  const z0s = composite.portZ0;
  const uniform = z0s.every((z) => z === z0s[0]);
  const comments = [
    `Portolan composite of scenario "${opts.scenarioName}"`,
    ...composite.ports.map((name, i) => `port ${i + 1}: ${name} (Z0 ${z0s[i]} ohm)`),
    ...(composite.warnings ?? []).map((w) => `warning: ${w}`),
  ];
  return writeTouchstone(
    { frequencies: composite.frequencies, s: composite.s, z0: uniform ? z0s[0] : Float64Array.from(z0s.flatMap((z) => [z, 0])), comments },
    { version: uniform ? "1.1" : "2.0", format: "RI", unit: "Hz", ...(opts.digits !== undefined ? { digits: opts.digits } : {}) },
  );
}
