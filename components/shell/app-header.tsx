import { IntentLink as Link } from "@/components/ui/intent-link";
import type { ReactNode } from "react";
import { NavLinks, type NavLink } from "./nav-links";
import { ThemeToggle } from "./theme-toggle";
import { UserMenu } from "./user-menu";
import { Wordmark } from "./compass-rose";

/** Id of the element the skip link jumps to: give the page's <main> this id. */
export const MAIN_CONTENT_ID = "main-content";

export type AppHeaderUser = { name: string; email: string; isSiteAdmin: boolean };

export type AppHeaderProps = {
  user: AppHeaderUser | null;
  signOutAction?: () => Promise<void>;
  /** Show the development outbox link (defaults to on outside production builds). */
  showOutbox?: boolean;
  /** Extra controls at the right end, e.g. the helm trigger. */
  actions?: ReactNode;
  hrefs?: { projects?: string; admin?: string; outbox?: string; signIn?: string };
};

/** The top bar on every signed-in page: skip link, wordmark, navigation, theme and account menu. */
export function AppHeader({ user, signOutAction, showOutbox, actions, hrefs }: AppHeaderProps) {
  const projects = hrefs?.projects ?? "/projects";
  const outboxVisible = showOutbox ?? process.env.NODE_ENV !== "production";
  const links: NavLink[] = [];
  if (user) {
    links.push({ href: projects, label: "Projects" });
    links.push({ href: "/account", label: "Account" });
    if (user.isSiteAdmin) links.push({ href: hrefs?.admin ?? "/admin", label: "Admin" });
    if (user.isSiteAdmin && outboxVisible) links.push({ href: hrefs?.outbox ?? "/dev/outbox", label: "Outbox" });
  }

  return (
    <header className="sticky top-0 z-40 border-b border-rule bg-paper">
      <a
        href={`#${MAIN_CONTENT_ID}`}
        className="sr-only focus:not-sr-only focus:absolute focus:top-2 focus:left-2 focus:z-50 focus:rounded-md focus:bg-ink focus:px-3 focus:py-2 focus:text-sm focus:text-on-ink"
      >
        Skip to content
      </a>
      <div className="mx-auto flex h-14 max-w-[96rem] items-center gap-2 px-3 sm:gap-4 sm:px-6">
        <Link
          href={user ? projects : "/"}
          className="rounded-md focus-visible:outline-2 focus-visible:outline-offset-4 focus-visible:outline-focus"
          aria-label="Portolan home"
        >
          <Wordmark roseSize={24} />
        </Link>
        {links.length > 0 ? (
          // below 640 px the links move into the account menu (the header would overflow otherwise)
          <nav aria-label="Main" className="ml-2 hidden sm:block">
            <NavLinks links={links} />
          </nav>
        ) : null}
        <div className="ml-auto flex items-center gap-2">
          {actions}
          <ThemeToggle />
          {user ? (
            <UserMenu name={user.name} email={user.email} isSiteAdmin={user.isSiteAdmin} signOutAction={signOutAction} links={links} />
          ) : (
            <Link href={hrefs?.signIn ?? "/sign-in"} className="text-link text-sm font-medium">
              Sign in
            </Link>
          )}
        </div>
      </div>
    </header>
  );
}
