"use client";

import Link from "next/link";
import { useState, type ComponentProps } from "react";

/**
 * A `<Link>` that prefetches its page only once a person shows intent (pointer over it, or keyboard
 * focus), following the hover-triggered pattern of Next's prefetching guide. The header, breadcrumbs
 * and project tabs hold a dozen links on every page: prefetched on sight, their server renders competed
 * with the workspace's own first requests on a small server (tests/bench/pages.ts).
 */
export function IntentLink({ onMouseEnter, onFocus, ...props }: ComponentProps<typeof Link>) {
  const [intent, setIntent] = useState(false);
  return (
    <Link
      {...props}
      prefetch={intent ? null : false}
      onMouseEnter={(event) => {
        setIntent(true);
        onMouseEnter?.(event);
      }}
      onFocus={(event) => {
        setIntent(true);
        onFocus?.(event);
      }}
    />
  );
}
