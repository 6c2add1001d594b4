import Link from "next/link";
import { redirect } from "next/navigation";
import { buttonClassName } from "@/components/ui/button";
import { BearingBackdrop } from "@/components/shell/bearing-backdrop";
import { CompassRose } from "@/components/shell/compass-rose";
import { ThemeToggle } from "@/components/shell/theme-toggle";
import { getCurrentSession } from "@/lib/server/auth/session";

export default async function LandingPage() {
  const { user } = await getCurrentSession();
  if (user) redirect("/projects");

  return (
    <div className="relative isolate flex min-h-dvh flex-col overflow-hidden">
      <BearingBackdrop origin={[0.72, 0.42]} className="-z-10" />
      <div className="absolute top-3 right-3">
        <ThemeToggle />
      </div>
      <main id="main-content" className="mx-auto flex w-full max-w-5xl flex-1 flex-col justify-center px-6 py-16 sm:px-10">
        <div className="flex max-w-xl flex-col gap-6 rounded-card border border-rule bg-paper/85 p-7 shadow-sm backdrop-blur-[2px] sm:p-9">
          <div className="flex items-center gap-3">
            <CompassRose size={44} />
            <h1 className="text-3xl font-semibold tracking-[0.1em] uppercase">Portolan</h1>
          </div>
          <p className="text-lg leading-relaxed">
            Prove that an RF front end meets its port-to-port requirements before the hardware exists.
          </p>
          <p className="text-sm leading-relaxed text-muted">
            Place N-port parts on a chart, link their ports and name the ports of the whole system. Portolan
            computes the composite S-parameters over the band, checks isolation, match and insertion loss,
            traces where leakage flows, compares switch settings and checks drive levels, then packs the
            evidence into a bundle for the reviewer.
          </p>
          <div className="flex flex-wrap items-center gap-3">
            <Link href="/sign-in" className={buttonClassName({ variant: "primary", size: "lg" })}>
              Sign in
            </Link>
            <Link href="/sign-up" className="text-link text-sm font-medium">
              Create an account
            </Link>
          </div>
        </div>
      </main>
      <footer className="mx-auto w-full max-w-5xl px-6 pb-6 text-xs text-muted sm:px-10">
        <p className="max-w-2xl">
          RF power can burn people and destroy parts. Figures are estimates from the data you enter; verify
          transmitting systems with calibrated instruments before use.
        </p>
      </footer>
    </div>
  );
}
