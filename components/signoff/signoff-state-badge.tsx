import { Badge, type BadgeTone } from "@/components/ui/badge";
import { STATE_LABELS, type SignoffItem } from "./types";

const tones: Record<SignoffItem["state"], BadgeTone> = { requested: "info", approved: "pass", changes_requested: "fail" };

/** The recorded state, and a separate "Stale" badge when the scenario has changed since (words, not colour alone). */
export function SignoffStateBadge({ signoff }: { signoff: Pick<SignoffItem, "state" | "stale" | "latestRevisionNumber" | "revisionNumber"> }) {
  return (
    <span className="inline-flex flex-wrap items-center gap-1">
      <Badge tone={tones[signoff.state]} data-state={signoff.state}>
        {STATE_LABELS[signoff.state]}
      </Badge>
      {signoff.stale ? (
        <Badge tone="warn" data-state="stale" title={`The scenario is now at revision ${signoff.latestRevisionNumber} with different content; this sign-off covers revision ${signoff.revisionNumber}.`}>
          Stale: scenario changed since
        </Badge>
      ) : null}
    </span>
  );
}
