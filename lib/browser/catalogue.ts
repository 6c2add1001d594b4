/**
 * The block catalogue as the workspace shows it: titles, summaries, port labels and parameter
 * declarations from the engine's BLOCK_CATALOGUE, plus the part ("touchstone") kind it does not list.
 */
import { BLOCK_CATALOGUE } from "@/engine/blocks/catalogue";
import type { ParamInfo } from "@/engine/blocks/params";
import type { BlockKind, BlockSpec } from "@/engine/types";
import { findPart, type PartSummary } from "./scenario-model";

export type { ParamInfo };

/** Kinds offered in the add-block list, in the order a front end is usually drawn. */
export const ADDABLE_KINDS: Exclude<BlockKind, "touchstone">[] = [
  "attenuator",
  "line",
  "filter",
  "amplifier",
  "switch",
  "coupler",
  "splitter",
  "circulator",
  "isolator",
  "phase_shifter",
  "hybrid90",
  "hybrid180",
  "tee",
  "antenna",
  "array",
  "load",
];

export function kindTitle(kind: BlockKind): string {
  return kind === "touchstone" ? "Part" : BLOCK_CATALOGUE[kind].title;
}

export function kindSummary(kind: BlockKind): string {
  return kind === "touchstone" ? "Measured or vendor data from a Touchstone file." : BLOCK_CATALOGUE[kind].summary;
}

/** Parameter declarations of a kind (none for parts). */
export function paramsOf(kind: BlockKind): ParamInfo[] {
  return kind === "touchstone" ? [] : BLOCK_CATALOGUE[kind].params;
}

/** Labels of ports 1…n ("input", "through"…); plain numbers for parts. */
export function portLabelsOf(block: BlockSpec, n: number): string[] {
  if (block.kind === "touchstone") return Array.from({ length: n }, (_, k) => String(k + 1));
  return BLOCK_CATALOGUE[block.kind].portLabels(block.params);
}

/** What the card shows under the id: the kind's title, or the part's name. */
export function blockTitle(block: BlockSpec, parts: readonly PartSummary[]): string {
  if (block.kind !== "touchstone") return kindTitle(block.kind);
  return findPart(block, parts)?.name ?? block.file?.replace(/^parts\//, "") ?? "Part";
}
