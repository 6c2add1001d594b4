/**
 * Ranking in the add-block list. cmdk's default fuzzy score let "Coupler" outrank a part named exactly
 * what was typed; a person who types a whole name means that one, so exact names come first.
 */

/** Names of an entry are joined with this in the list item's value (kind title | kind, or part name | file). */
export const NAME_SEPARATOR = "|";

function norm(s: string): string {
  return s.trim().toLowerCase().replace(/\s+/g, " ");
}

/**
 * Score of one entry for the text typed, 0 (hidden) to 1: an exact name 1, a name starting with the
 * text 0.8, a word of a name starting with it 0.6, a name containing it 0.4, a keyword starting with it
 * 0.3, every typed word found somewhere 0.2.
 */
export function rankBlockMatch(value: string, search: string, keywords: readonly string[] = []): number {
  const q = norm(search);
  if (q === "") return 1;
  const names = value.split(NAME_SEPARATOR).map(norm).filter(Boolean);
  if (names.some((n) => n === q)) return 1;
  if (names.some((n) => n.startsWith(q))) return 0.8;
  if (names.some((n) => n.split(/[\s_.\-/]+/).some((w) => w.startsWith(q)))) return 0.6;
  if (names.some((n) => n.includes(q))) return 0.4;
  const kw = keywords.map(norm);
  if (kw.some((k) => k.startsWith(q))) return 0.3;
  const hay = [...names, ...kw].join(" ");
  if (q.split(" ").every((w) => hay.includes(w))) return 0.2;
  return 0;
}
