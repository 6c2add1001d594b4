import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { Button } from "@/components/ui/button";
import { getCurrentSession } from "@/lib/server/auth/session";
import { signOutAction } from "../actions";

export const metadata: Metadata = { title: "Sign out" };

/** Signing out is a POST (a form), so a link or prefetch can never end a session by accident. */
export default async function SignOutPage() {
  const { user } = await getCurrentSession();
  if (!user) redirect("/sign-in");
  return (
    <div className="flex flex-col gap-5">
      <h1 className="text-2xl font-semibold">Sign out</h1>
      <p className="text-sm text-muted">
        You are signed in as <span className="font-medium text-ink">{user.email}</span>.
      </p>
      <form action={signOutAction} className="flex items-center gap-3">
        <Button type="submit">Sign out</Button>
        <Link className="text-link text-sm" href="/projects">
          Back to projects
        </Link>
      </form>
    </div>
  );
}
