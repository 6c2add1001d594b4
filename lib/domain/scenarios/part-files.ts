import { pinnedPartPath } from "@/engine/system/parts";

/**
 * The part texts a scenario's blocks need, each once, keyed as the engine looks them up: `parts/<fileName>`
 * for version 1, `parts/v<N>/<fileName>` for a block pinning version N (pinnedPartPath,
 * docs/scenario-format.md#part-versions). Shared by the server (which reads only these texts) and the
 * workspace (which fetches only these).
 */
export function partFilesOf(
  content: { blocks?: readonly { kind?: string; file?: string; data?: string; part_version?: number }[] } | null | undefined,
): string[] {
  const files = new Set<string>();
  for (const block of content?.blocks ?? []) {
    if (block.kind === "touchstone" && block.data === undefined && typeof block.file === "string") files.add(pinnedPartPath(block.file, block.part_version));
  }
  return [...files];
}
