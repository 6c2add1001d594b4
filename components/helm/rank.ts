import { defaultFilter } from "cmdk";

/** "Run isolation check" → "isolation"; "Trace leak paths" stays as it is. */
function commandName(title: string): string {
  return title
    .toLowerCase()
    .replace(/^run\s+/, "")
    .replace(/\s+check$/, "")
    .replace(/…$/, "")
    .trim();
}

/**
 * The helm's ranking of an item for what was typed (cmdk's filter: 0 hides the item, higher comes
 * first). `keywords[0]` is the item's title or label. A typed exact command name beats everything
 * ("isolation" then Enter runs the isolation check, not the leak trace that lists isolation among its
 * keywords); then a title that starts with it; then an exact keyword; then cmdk's own fuzzy score,
 * scaled below those.
 */
export function rankHelmItem(value: string, search: string, keywords: string[] = []): number {
  const typed = search.trim().toLowerCase().replace(/\s+/g, " ");
  if (typed === "") return 1;
  const title = (keywords[0] ?? "").toLowerCase();
  if (title && (typed === title || typed === commandName(title))) return 1;
  if (title && (title.startsWith(typed) || commandName(title).startsWith(typed))) return 0.95;
  if (keywords.slice(1).some((k) => k.toLowerCase() === typed)) return 0.9;
  return 0.85 * defaultFilter(value, search, keywords);
}
