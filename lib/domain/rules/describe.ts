import { formatHz } from "@/engine/checks/band";
import type { RuleSpec } from "@/engine/types";

/** A rule in words for tables and reports: its ports, its band and its requirement. */
export function describeRule(spec: RuleSpec): { ports: string; band: string; limit: string } {
  const band = "band" in spec && spec.band ? `${formatHz(spec.band[0])} to ${formatHz(spec.band[1])}` : "whole plan";
  switch (spec.kind) {
    case "isolation":
      return { ports: `${spec.from} → ${spec.to}${spec.one_way ? " (one way)" : ""}`, band, limit: `isolation ≥ ${spec.min_db} dB` };
    case "insertion_loss":
      return { ports: `${spec.from} → ${spec.to}`, band, limit: `insertion loss ≤ ${spec.max_db} dB` };
    case "match":
      return {
        ports: spec.port,
        band,
        limit: [spec.min_return_loss_db !== undefined ? `return loss ≥ ${spec.min_return_loss_db} dB` : "", spec.max_vswr !== undefined ? `VSWR ≤ ${spec.max_vswr}` : ""].filter(Boolean).join(", "),
      };
    case "drive":
      return { ports: spec.sources.map((s) => `${s.port} ${s.dbm} dBm`).join(", "), band, limit: spec.coherent ? "within ratings, coherent sum" : "within ratings" };
    case "noise_figure":
      return { ports: `${spec.from} → ${spec.to}`, band, limit: `noise figure ≤ ${spec.max_db} dB` };
    case "gain":
      return { ports: `${spec.from} → ${spec.to}`, band, limit: [spec.min_db !== undefined ? `gain ≥ ${spec.min_db} dB` : "", spec.max_db !== undefined ? `gain ≤ ${spec.max_db} dB` : ""].filter(Boolean).join(", ") };
    case "headroom":
      return { ports: `${spec.from} → ${spec.to}, ${spec.input_dbm} dBm in`, band, limit: `headroom ≥ ${spec.min_db} dB` };
  }
}

/** One line: "isolation TX ↔ RX ≥ 30 dB, 2.4 GHz to 2.48 GHz". */
export function ruleText(spec: RuleSpec): string {
  const d = describeRule(spec);
  return `${d.limit} (${d.ports}), ${d.band}`;
}
