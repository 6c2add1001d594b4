import Link from "next/link";
import type { ReactNode } from "react";
import { CompassRose } from "./compass-rose";

export type NotFoundViewProps = {
  title?: string;
  description?: ReactNode;
  /** where "back" goes: the nearest page the person can certainly see */
  backHref?: string;
  backLabel?: string;
  /** 2 inside a page that already has its h1 (the project header) */
  headingLevel?: 1 | 2;
};

/**
 * The one "not found" message: off the chart, with a way back. Missing pages, bad ids and projects the
 * viewer is not a member of all read the same, so a 404 does not tell whether a project exists.
 */
export function NotFoundView({
  title = "Page not found",
  description = "There is nothing at this address, or it is not shared with you.",
  backHref = "/projects",
  backLabel = "Back to your projects",
  headingLevel = 1,
}: NotFoundViewProps) {
  const Heading = headingLevel === 1 ? "h1" : "h2";
  return (
    <div className="mx-auto my-12 flex max-w-prose flex-col items-center gap-4 text-center">
      <CompassRose size={56} className="text-muted" />
      <p className="figures text-sm font-semibold tracking-widest text-muted">404</p>
      <Heading className="text-2xl font-semibold text-ink">{title}</Heading>
      <div className="text-sm text-muted">{description}</div>
      <Link className="text-link text-sm font-medium" href={backHref}>
        {backLabel}
      </Link>
    </div>
  );
}
