/**
 * Part versions pinned by a scenario's touchstone blocks (`part_version`, absent = 1;
 * docs/scenario-format.md#part-versions): which blocks are behind the library, moving one, and which pins a
 * save changed (for the audit log). Pure: safe on the server and in the browser.
 */

type BlockLike = { id: string; kind?: string; file?: string; data?: string; part_version?: number };
type ScenarioLike = { blocks?: readonly BlockLike[] };

/** The version a block pins, or null when it does not use a library part (another kind, or inline data). */
export function pinnedVersionOf(block: BlockLike): number | null {
  if (block.kind !== "touchstone" || block.data !== undefined || typeof block.file !== "string") return null;
  return block.part_version ?? 1;
}

/** The blocks that pin an older version than the latest the library has (`latest`: file name → version). */
export function blocksBehind(scenario: ScenarioLike, latest: ReadonlyMap<string, number>): { blockId: string; fileName: string; pinned: number; latest: number }[] {
  const out: { blockId: string; fileName: string; pinned: number; latest: number }[] = [];
  for (const block of scenario.blocks ?? []) {
    const pinned = pinnedVersionOf(block);
    if (pinned === null || !block.file?.startsWith("parts/")) continue;
    const fileName = block.file.slice("parts/".length);
    const newest = latest.get(fileName);
    if (newest !== undefined && pinned < newest) out.push({ blockId: block.id, fileName, pinned, latest: newest });
  }
  return out;
}

/**
 * The scenario with block `id` pinning `version` of its part; version 1 is written as no `part_version`, so
 * that a scenario that never moved keeps its content hash.
 */
export function setPartVersion<S extends ScenarioLike>(scenario: S, id: string, version: number): S {
  return {
    ...scenario,
    blocks: (scenario.blocks ?? []).map((block) => {
      if (block.id !== id) return block;
      const { part_version: _old, ...rest } = block;
      void _old;
      return version > 1 ? { ...rest, part_version: version } : rest;
    }),
  };
}

/** Blocks whose pin changed between two contents of a scenario (same id and file, another version). */
export function partPinMoves(before: ScenarioLike, after: ScenarioLike): { blockId: string; file: string; from: number; to: number }[] {
  const old = new Map((before.blocks ?? []).map((b) => [b.id, b]));
  const moves: { blockId: string; file: string; from: number; to: number }[] = [];
  for (const block of after.blocks ?? []) {
    const prior = old.get(block.id);
    const to = pinnedVersionOf(block);
    const from = prior ? pinnedVersionOf(prior) : null;
    if (prior && to !== null && from !== null && prior.file === block.file && from !== to) moves.push({ blockId: block.id, file: block.file as string, from, to });
  }
  return moves;
}
