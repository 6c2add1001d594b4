import Link from "next/link";
import type { ReactNode } from "react";
import { BearingBackdrop } from "@/components/shell/bearing-backdrop";
import { Wordmark } from "@/components/shell/compass-rose";
import { ThemeToggle } from "@/components/shell/theme-toggle";

/** Sign-in, sign-up, password reset and invitation pages: one card on the chart paper. */
export default function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <div className="relative isolate flex min-h-dvh flex-col">
      <BearingBackdrop origin={[0.18, 0.3]} className="-z-10" />
      <header className="flex items-center justify-between px-5 py-4">
        <Link href="/" aria-label="Portolan home" className="rounded-md focus-visible:outline-2 focus-visible:outline-offset-4 focus-visible:outline-focus">
          <Wordmark roseSize={24} />
        </Link>
        <ThemeToggle />
      </header>
      <main id="main-content" className="flex flex-1 items-start justify-center px-4 pt-8 pb-16 sm:pt-16">
        <div className="w-full max-w-md rounded-card border border-rule bg-paper/92 p-6 shadow-sm backdrop-blur-[2px] sm:p-8">{children}</div>
      </main>
    </div>
  );
}
