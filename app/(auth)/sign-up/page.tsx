import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { Alert } from "@/components/ui/alert";
import { getSignupMode } from "@/db/queries/settings";
import { countUsers } from "@/db/queries/users";
import { getCurrentSession } from "@/lib/server/auth/session";
import { safeNextPath } from "@/lib/server/actions";
import { SignUpForm } from "./sign-up-form";

export const metadata: Metadata = { title: "Create an account" };

export default async function SignUpPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  const next = safeNextPath(typeof params.next === "string" ? params.next : null, "");
  const { user } = await getCurrentSession();
  if (user) redirect(next || "/projects");
  const first = (await countUsers()) === 0;
  const open = first || (await getSignupMode()) === "open";
  return (
    <div className="flex flex-col gap-5">
      <div className="flex flex-col gap-1">
        <h1 className="text-2xl font-semibold">Create an account</h1>
        {first ? <p className="text-sm text-muted">This is the first account: it becomes the site admin, who manages users and sign-up.</p> : null}
      </div>
      {open ? (
        <SignUpForm next={next} />
      ) : (
        <Alert tone="info" title="Sign-up is by invitation only">
          Ask a project owner to invite you; the e-mail they send has a link that creates your account.
        </Alert>
      )}
      <p className="text-sm text-muted">
        Already have an account?{" "}
        <Link className="text-link" href={next ? `/sign-in?next=${encodeURIComponent(next)}` : "/sign-in"}>
          Sign in
        </Link>
      </p>
    </div>
  );
}
