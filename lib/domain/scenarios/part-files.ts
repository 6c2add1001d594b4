/**
 * The part files a scenario's blocks name (`parts/<fileName>`), each once: what a solve of it reads.
 * Shared by the server (which reads only these texts) and the workspace (which fetches only these).
 */
export function partFilesOf(content: { blocks?: readonly { kind?: string; file?: string; data?: string }[] } | null | undefined): string[] {
  const files = new Set<string>();
  for (const block of content?.blocks ?? []) {
    if (block.kind === "touchstone" && block.data === undefined && typeof block.file === "string") files.add(block.file);
  }
  return [...files];
}
