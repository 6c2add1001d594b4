/**
 * One solve of the workspace, as the engine worker runs it: parse, prepare and solve the scenario, and
 * reduce the Solution to what the results panel draws. Errors come back as messages, never as throws.
 */
import { parseScenario } from "@/engine/scenario";
import { solveScenario } from "@/engine/system";
import type { Scenario } from "@/engine/types";
import type { SolvedView } from "@/lib/domain/results/results-math";

export type SolveRequest = {
  /** increases with every request; a response with an older seq than the latest is stale */
  seq: number;
  scenario: Scenario;
  /** Touchstone texts keyed as blocks name them ("parts/<fileName>") */
  parts: Record<string, string>;
};

export type SolveResponse =
  | {
      seq: number;
      ok: true;
      view: SolvedView;
      warnings: string[];
      /** information beside the results (how part data was interpolated onto the plan) */
      notes: string[];
      /** block ports left unlinked and unmarked, terminated in the system Z0 ("PAD1:2") */
      unterminated: string[];
      /** time spent in the engine, ms */
      solveMs: number;
    }
  | { seq: number; ok: false; error: string; kind: string };

/** Runs one solve; never throws. */
export function runSolve(request: SolveRequest): SolveResponse {
  const started = performance.now();
  try {
    const scenario = parseScenario(request.scenario, { parts: request.parts });
    const solution = solveScenario(scenario, { parts: request.parts });
    const system = solution.system;
    const unterminated = system.unterminated.map((index) => {
      const info = system.blockPorts[index];
      return `${info.block}:${info.port}`;
    });
    return {
      seq: request.seq,
      ok: true,
      view: {
        frequencies: solution.frequencies,
        ports: solution.ports,
        portZ0: solution.portZ0,
        s: solution.s,
      },
      warnings: [...new Set([...system.warnings, ...solution.warnings])],
      notes: system.notes ?? [],
      unterminated,
      solveMs: performance.now() - started,
    };
  } catch (error) {
    const err = error instanceof Error ? error : new Error(String(error));
    return { seq: request.seq, ok: false, error: nameBlock(err.message, request.scenario), kind: err.name };
  }
}

/** "blocks[5].params.cutoff_hz: …" → "FLT1 (blocks[5].params.cutoff_hz): …", so that the chart's id is named. */
export function nameBlock(message: string, scenario: Scenario): string {
  const m = /^blocks\[(\d+)\]/.exec(message);
  const block = m ? scenario.blocks[Number(m[1])] : undefined;
  if (!m || !block) return message;
  const colon = message.indexOf(": ");
  return colon > 0 ? `${block.id} (${message.slice(0, colon)}): ${message.slice(colon + 2)}` : `${block.id}: ${message}`;
}
