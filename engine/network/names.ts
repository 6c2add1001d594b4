// Human-readable names of block ports and links for messages.

import type { PreparedSystem } from "../types";

/**
 * "BLOCK:PORT" for a global block-port index, or the system port's name for a Z0-step port.
 *
 * @example portName(sys, 0) // "PAD:1"
 */
export function portName(sys: PreparedSystem, p: number): string {
  const info = sys.blockPorts[p];
  if (info) return `${info.block}:${info.port}`;
  const P = sys.blockPorts.length;
  const m = Math.floor((p - P) / 2);
  const name = sys.systemPorts[m]?.name ?? `port ${m + 1}`;
  return `${name} (Z0 step)`;
}

/**
 * "A:1–B:2" for a pair of global port indices.
 *
 * @example linkName(sys, 1, 2) // "PAD:2–SW1:1"
 */
export function linkName(sys: PreparedSystem, p: number, q: number): string {
  return `${portName(sys, p)}–${portName(sys, q)}`;
}

/** Messages of the interconnection write frequencies with the engine's one formatter. */
export { formatHz } from "../format";
