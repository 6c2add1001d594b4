import type { Scenario } from "@/engine/types";
import type { ScenarioTemplate } from "@/lib/base/validation/scenarios";

/** Plan of new scenarios: the 2.4 GHz ISM band with margin, 1 MHz steps. */
export const DEFAULT_PLAN = { start: 2.3e9, stop: 2.6e9, points: 301 } as const;

export const TEMPLATE_LABELS: Record<ScenarioTemplate, string> = {
  blank: "Blank chart",
  "pad-chain": "Two pads in a chain (TX → OUT)",
  "tr-switch": "T/R switch with an antenna (TX, RX)",
};

/** The first revision of a new scenario made from a template. */
export function scenarioFromTemplate(template: ScenarioTemplate, name: string): Scenario {
  const base: Scenario = { format: "portolan.scenario/1", name, z0: 50, frequency: { ...DEFAULT_PLAN }, blocks: [], links: [], ports: [] };
  if (template === "pad-chain") {
    return {
      ...base,
      blocks: [
        { id: "PAD1", kind: "attenuator", params: { loss_db: 3 }, position: { x: 0, y: 0 } },
        { id: "PAD2", kind: "attenuator", params: { loss_db: 3 }, position: { x: 260, y: 0 } },
      ],
      links: [["PAD1:2", "PAD2:1"]],
      ports: [
        { name: "TX", at: "PAD1:1" },
        { name: "OUT", at: "PAD2:2" },
      ],
    };
  }
  if (template === "tr-switch") {
    return {
      ...base,
      blocks: [
        { id: "SW1", kind: "switch", params: { throws: 2, insertion_loss_db: 0.4, isolation_db: 30 }, state: 1, position: { x: 0, y: 0 } },
        { id: "ANT1", kind: "antenna", params: { return_loss_db: 15 }, position: { x: -280, y: 0 } },
      ],
      links: [["ANT1:1", "SW1:1"]],
      ports: [
        { name: "TX", at: "SW1:2" },
        { name: "RX", at: "SW1:3" },
      ],
    };
  }
  return base;
}
