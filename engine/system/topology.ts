// Links and system ports of a scenario resolved to global block-port indices, from the block port counts
// alone: shared by prepareSystem and the size estimate (which must not evaluate any block).
import { splitPortRef } from "../scenario/parse-scenario";
import { EngineInputError, type BlockPortInfo, type PreparedSystem, type Scenario } from "../types";

/** The index maps of a PreparedSystem and the warnings about matched (unconnected) ports. */
export type Topology = Pick<PreparedSystem, "blockPorts" | "blockOffset" | "links" | "systemPorts" | "unterminated" | "warnings">;

/**
 * Resolves links and system ports to global block-port indices (blocks in scenario order, ports 1…n within
 * each block). Block ports that are neither linked nor system ports are matched terminations; each gets a
 * warning.
 *
 * @param scenario - a validated scenario
 * @param ports - port count of each block, scenario order
 * @returns blockPorts, blockOffset, links, systemPorts, unterminated, warnings
 * @throws EngineInputError naming the link or port that refers to a missing block or port
 * @example resolveTopology(scenario, [2, 2]).links // [[1, 2]] for PAD1:2–PAD2:1
 */
export function resolveTopology(scenario: Scenario, ports: number[]): Topology {
  const blockPorts: BlockPortInfo[] = [];
  const blockOffset: number[] = [];
  const indexOf = new Map<string, number>();
  scenario.blocks.forEach((spec, i) => {
    blockOffset.push(blockPorts.length);
    indexOf.set(spec.id, i);
    for (let p = 1; p <= ports[i]; p++) blockPorts.push({ index: blockPorts.length, block: spec.id, port: p });
  });

  const resolve = (ref: string, where: string): number => {
    const { block, port } = splitPortRef(ref);
    const i = indexOf.get(block);
    if (i === undefined) throw new EngineInputError(where, `no block with id "${block}" (in "${ref}")`);
    const n = ports[i];
    if (port < 1 || port > n) throw new EngineInputError(where, `block ${block} has ${n} port${n === 1 ? "" : "s"}; there is no port ${port} (in "${ref}")`);
    return blockOffset[i] + port - 1;
  };

  const used = new Uint8Array(blockPorts.length);
  const links: [number, number][] = scenario.links.map((link, i) => {
    const a = resolve(link[0], `links[${i}][0]`);
    const b = resolve(link[1], `links[${i}][1]`);
    used[a] = 1;
    used[b] = 1;
    return [a, b];
  });
  const systemPorts = scenario.ports.map((sp, i) => {
    const at = resolve(sp.at, `ports[${i}].at`);
    used[at] = 1;
    return { name: sp.name, at, z0: sp.z0 ?? scenario.z0 };
  });
  const unterminated: number[] = [];
  const warnings: string[] = [];
  for (let p = 0; p < blockPorts.length; p++) {
    if (used[p]) continue;
    unterminated.push(p);
    warnings.push(`block ${blockPorts[p].block} port ${blockPorts[p].port} is not linked and not a system port: treated as a matched termination`);
  }
  return { blockPorts, blockOffset, links, systemPorts, unterminated, warnings };
}
