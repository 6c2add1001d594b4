import type { ReactNode } from "react";
import { AppHeader, MAIN_CONTENT_ID } from "@/components/shell/app-header";
import { signOutAction } from "@/app/(auth)/actions";
import { requireUser } from "@/lib/server/auth/session";
import { isOutboxAvailable } from "@/lib/server/outbox";
import { Helm, HelmProvider } from "@/components/helm";

/** Every signed-in page: the header, then the page, and the helm (Ctrl/Cmd+K). Signed-out visitors go to /sign-in. */
export default async function WorkspaceLayout({ children }: { children: ReactNode }) {
  const user = await requireUser();
  return (
    <HelmProvider>
      <div data-app-frame className="flex min-h-dvh flex-col">
        <AppHeader user={user} signOutAction={signOutAction} showOutbox={isOutboxAvailable()} />
        <main id={MAIN_CONTENT_ID} tabIndex={-1} className="mx-auto flex w-full outline-none max-w-[96rem] flex-1 flex-col px-4 py-6 sm:px-6">
          {children}
        </main>
        <Helm />
      </div>
    </HelmProvider>
  );
}
