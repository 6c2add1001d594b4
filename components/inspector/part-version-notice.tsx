"use client";

import Link from "next/link";
import { useParams } from "next/navigation";
import { Button } from "@/components/ui";
import { findPart } from "@/lib/browser/scenario-model";
import type { BlockToolProps } from "./replace-form";
import { pinnedVersionOf, setPartVersion } from "@/lib/domain/parts/pins";

/**
 * The version of its part a touchstone block pins, and when the library has a newer one, "Newer version
 * available" with one action to move to it: an ordinary edit of the working draft, in the scenario from the
 * next revision saved (Save revision).
 */
export function PartVersionNotice({ scenario, block, parts, readOnly, commit, notify }: BlockToolProps) {
  const params = useParams<{ projectId?: string }>();
  const part = findPart(block, parts);
  const pinned = pinnedVersionOf(block);
  if (!part || pinned === null) return null;
  const latest = part.version ?? 1;
  const link = params?.projectId ? `/projects/${params.projectId}/parts/${part.id}` : null;
  const partLink = link ? (
    <Link href={link} className="underline underline-offset-4 hover:text-ink">
      part page
    </Link>
  ) : null;
  if (pinned >= latest) {
    return (
      <p className="text-xs text-muted" data-testid="part-version">
        Uses version {pinned} of {part.fileName}
        {latest > 1 ? " (the latest)" : ""}
        {partLink ? <> · {partLink}</> : null}
      </p>
    );
  }
  return (
    <div role="status" aria-label="Newer version available" className="flex flex-col gap-2 rounded-card border border-warn/50 bg-warn/10 p-3 text-sm">
      <p className="font-medium text-ink">Newer version available</p>
      <p className="text-xs text-muted">
        {block.id} uses version {pinned} of {part.fileName}; the library has version {latest}.{partLink ? <> See what changed on the {partLink}.</> : null}
      </p>
      {!readOnly ? (
        <Button
          size="sm"
          variant="secondary"
          className="self-start"
          onClick={() => {
            commit(setPartVersion(scenario, block.id, latest));
            notify(`${block.id} now uses version ${latest} of ${part.fileName}.`);
          }}
        >
          Move to version {latest}
        </Button>
      ) : null}
    </div>
  );
}
