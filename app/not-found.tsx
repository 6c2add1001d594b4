import type { Metadata } from "next";
import Link from "next/link";
import { Wordmark } from "@/components/shell/compass-rose";
import { NotFoundView } from "@/components/shell/not-found-view";

export const metadata: Metadata = { title: "Not found" };

/** Any address the app has no page for (HTTP 404), signed in or not: outside the app shell, so its own main landmark. */
export default function NotFound() {
  return (
    <div className="flex min-h-dvh flex-col">
      <header className="border-b border-rule px-4 py-3 sm:px-6">
        <Link href="/" aria-label="Portolan home" className="inline-flex">
          <Wordmark />
        </Link>
      </header>
      <main id="main-content" className="flex flex-1 flex-col px-4 py-6 sm:px-6">
        <NotFoundView />
      </main>
    </div>
  );
}
