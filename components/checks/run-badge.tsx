import type { Verdict } from "@/engine/checks/types";
import { Badge, VerdictBadge } from "@/components/ui";
import type { CheckName } from "@/lib/domain/checks/inputs";

/** Checks that describe the network rather than judge it against a rule. */
const ANALYSES: ReadonlySet<string> = new Set(["leak_trace", "power_ledger"]);

export function isAnalysis(check: string): boolean {
  return ANALYSES.has(check);
}

/**
 * The mark beside a stored run: a verdict for checks judged against rules, a neutral "analysis" label for
 * the leak trace and the ledger (a green pass on them read as "the design is fine", which they never say).
 */
export function RunBadge({ check, verdict }: { check: CheckName | string; verdict: Verdict }) {
  if (isAnalysis(check)) {
    return (
      <Badge tone="neutral" data-verdict="analysis" title="An analysis: it describes the network and judges nothing">
        analysis
      </Badge>
    );
  }
  return <VerdictBadge verdict={verdict} />;
}
