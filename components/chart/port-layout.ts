/**
 * Where each port handle sits on a block card: sides chosen so that signal flows left to right on the
 * chart (inputs on the left, outputs on the right), with the extra ports of three- and four-ports on
 * the sides that keep the documented numbering readable.
 */
import type { BlockKind } from "@/engine/types";

export type Side = "left" | "right" | "top" | "bottom";

export type PortPlacement = {
  /** 1-based port number */
  port: number;
  side: Side;
  /** position along the side, 0…1 */
  at: number;
};

function spread(ports: number[], side: Side): PortPlacement[] {
  return ports.map((port, k) => ({ port, side, at: (k + 1) / (ports.length + 1) }));
}

function range(from: number, to: number): number[] {
  const out: number[] = [];
  for (let p = from; p <= to; p++) out.push(p);
  return out;
}

/** Handle placements for a block of `kind` with `n` ports. */
export function placePorts(kind: BlockKind, n: number): PortPlacement[] {
  if (n <= 0) return [];
  switch (kind) {
    case "load":
    case "antenna":
      return spread([1], "left");
    case "tee":
    case "circulator":
      return [...spread([1], "left"), ...spread([2], "right"), ...spread([3], "bottom")];
    case "splitter":
      return [...spread([1], "left"), ...spread([2, 3], "right")];
    case "coupler":
    case "hybrid90":
    case "hybrid180":
      // 1 and 4 on the input side, 2 and 3 on the output side (through beside input)
      return [...spread([1, 4], "left"), ...spread([2, 3], "right")];
    case "switch":
      return [...spread([1], "left"), ...spread(range(2, n), "right")];
    case "array":
      return spread(range(1, n), "left");
    default: {
      if (n === 1) return spread([1], "left");
      const leftCount = Math.ceil(n / 2);
      return [...spread(range(1, leftCount), "left"), ...spread(range(leftCount + 1, n), "right")];
    }
  }
}

/** Card height (px) that leaves room for the ports on its busiest side. */
export function cardHeight(placements: PortPlacement[]): number {
  const perSide = (side: Side) => placements.filter((p) => p.side === side).length;
  const busiest = Math.max(perSide("left"), perSide("right"), 1);
  return Math.max(64, busiest * 26 + 20);
}
