/**
 * Limit lines of the rules on a trace: each rule that bounds |S_ij| in dB draws its limit over its band,
 * with the failing side shaded (docs/checks.md, engine/checks/rules.ts evaluateRule for what each rule
 * judges). A rule's limit is written in the quantity the trace shows, 20·log10|S_ij|:
 * - isolation from → to ≥ X dB: |S_to,from| ≤ −X dB (and |S_from,to| unless the rule is one way);
 * - insertion loss from → to ≤ X dB: |S_to,from| ≥ −X dB;
 * - gain from → to within [min, max] dB: |S_to,from| ≥ min and ≤ max;
 * - match at p: return loss ≥ RL, |S_pp| ≤ −RL dB; a VSWR limit v is RL = −20·log10((v − 1)/(v + 1)),
 *   and with both the stricter one judges, as the check does.
 * Noise figure, drive and headroom rules judge figures no S-parameter trace shows; they draw nothing.
 */
import { gammaFromVswr, returnLossDb } from "@/engine/checks/conversions";
import type { RuleSpec } from "@/engine/types";
import type { TraceQuantity } from "./results-math";

/** One limit over a band, in dB of |S_ij|. */
export type LimitLine = {
  /** the rule's name (its id, or `rules[i]` for an unnamed one) */
  rule: string;
  kind: RuleSpec["kind"];
  /** Hz, low ≤ high */
  band: [number, number];
  /** the limit, dB of |S_ij| */
  db: number;
  /** the side of the line that fails the rule */
  fails: "above" | "below";
};

/** A rule as the effective rule set names it (id filled in). */
export type PlottableRule = RuleSpec & { id?: string };

/**
 * The limit lines of `rules` on the trace S_ij (0-based i, j: the wave leaves port j, arrives at port i)
 * of a composite whose system ports are `ports`. Only the magnitude trace carries limits.
 * @example limitLinesForTrace([{ kind: "isolation", id: "tx-rx", from: "TX", to: "RX", band: [2.4e9, 2.5e9], min_db: 40 }], ["TX", "RX"], [1, 0], "db")
 *   // [{ rule: "tx-rx", kind: "isolation", band: [2.4e9, 2.5e9], db: -40, fails: "above" }]
 */
export function limitLinesForTrace(rules: readonly PlottableRule[], ports: readonly string[], pair: readonly [number, number], quantity: TraceQuantity): LimitLine[] {
  if (quantity !== "db") return [];
  const [i, j] = pair;
  const to = ports[i];
  const from = ports[j];
  if (to === undefined || from === undefined) return [];
  const out: LimitLine[] = [];
  rules.forEach((rule, index) => {
    const name = rule.id ?? `rules[${index}]`;
    const band: [number, number] | undefined = "band" in rule && rule.band ? [Math.min(...rule.band), Math.max(...rule.band)] : undefined;
    if (!band) return;
    const line = (db: number, fails: LimitLine["fails"]) => {
      if (Number.isFinite(db)) out.push({ rule: name, kind: rule.kind, band, db, fails });
    };
    // the forward trace of a two-port rule: the wave leaves `from` and arrives at `to`
    const forward = (r: { from: string; to: string }) => r.from !== r.to && r.from === from && r.to === to;
    switch (rule.kind) {
      case "isolation": {
        const reverse = !rule.one_way && rule.from !== rule.to && rule.from === to && rule.to === from;
        if (forward(rule) || reverse) line(-rule.min_db, "above");
        return;
      }
      case "insertion_loss":
        if (forward(rule)) line(-rule.max_db, "below");
        return;
      case "gain":
        if (!forward(rule)) return;
        if (rule.min_db !== undefined) line(rule.min_db, "below");
        if (rule.max_db !== undefined) line(rule.max_db, "above");
        return;
      case "match": {
        if (i !== j || rule.port !== to) return;
        let rl = -Infinity;
        if (rule.min_return_loss_db !== undefined) rl = rule.min_return_loss_db;
        if (rule.max_vswr !== undefined && rule.max_vswr >= 1) rl = Math.max(rl, returnLossDb(gammaFromVswr(rule.max_vswr)));
        line(-rl, "above");
        return;
      }
      default:
        return;
    }
  });
  return out;
}

/**
 * Where a limit line meets the plot, clipped to the frequencies shown: null when its band lies outside
 * [fMin, fMax]. The plot draws the line from `x0` to `x1` at `db`, shading the failing side.
 */
export function clipLimitToPlan(line: LimitLine, fMin: number, fMax: number): { x0: number; x1: number } | null {
  const x0 = Math.max(line.band[0], fMin);
  const x1 = Math.min(line.band[1], fMax);
  return x0 > x1 ? null : { x0, x1 };
}
