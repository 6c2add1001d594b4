import { parseScenario } from "@/engine/scenario";
import { pinnedPartPath } from "@/engine/system/parts";
import type { Scenario } from "@/engine/types";

/**
 * The scenario as the engine reads it: `expr` and the chart position removed from every block, so that
 * moving a block does not trigger a solve.
 */
export function scenarioForEngine(scenario: Scenario): Scenario {
  return {
    ...scenario,
    blocks: scenario.blocks.map((b) => {
      const { expr: _expr, position: _position, ...rest } = b;
      void _expr;
      void _position;
      return rest;
    }),
  };
}

/**
 * What the engine says about a (possibly incomplete) scenario: reference problems, missing parts.
 * Saving never fails on these; they are stored with the revision and shown as warnings.
 */
export function scenarioWarnings(content: Scenario, partTexts: Record<string, string>): string[] {
  const warnings: string[] = [];
  if (content.blocks.length === 0) warnings.push("The chart has no blocks yet.");
  if (content.ports.length === 0) warnings.push("No system ports are marked yet.");
  for (const block of content.blocks) {
    if (block.kind === "touchstone" && block.data === undefined && block.file !== undefined && partTexts[pinnedPartPath(block.file, block.part_version)] === undefined) {
      warnings.push(
        block.part_version !== undefined && block.part_version > 1
          ? `Block ${block.id} uses version ${block.part_version} of ${block.file}, which is not among the project's parts.`
          : `Block ${block.id} uses ${block.file}, which is not among the project's parts.`,
      );
    }
  }
  if (warnings.length > 0) return warnings;
  try {
    parseScenario(scenarioForEngine(content), { parts: partTexts });
  } catch (error) {
    warnings.push(error instanceof Error ? error.message : String(error));
  }
  return warnings;
}
