import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { Alert } from "@/components/ui/alert";
import { getSignupMode } from "@/db/queries/settings";
import { safeNextPath } from "@/lib/server/actions";
import { getCurrentSession } from "@/lib/server/auth/session";
import { SIGN_UP_REQUESTED_MESSAGE } from "@/lib/server/auth/accounts";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  const next = safeNextPath(typeof params.next === "string" ? params.next : null);
  const { user } = await getCurrentSession();
  if (user) redirect(next);
  const signupOpen = (await getSignupMode()) === "open";
  return (
    <div className="flex flex-col gap-5">
      <div className="flex flex-col gap-1">
        <h1 className="text-2xl font-semibold">Sign in</h1>
        <p className="text-sm text-muted">Use the e-mail address and password of your Portolan account.</p>
      </div>
      {params.reset === "1" ? <Alert tone="success">Your password has been changed. Sign in with the new one.</Alert> : null}
      {params["signed-up"] === "1" ? <Alert tone="success">{SIGN_UP_REQUESTED_MESSAGE}</Alert> : null}
      <SignInForm next={next} />
      <div className="flex flex-col gap-1.5 text-sm">
        <Link className="text-link" href="/forgot-password">
          Forgot your password?
        </Link>
        {signupOpen ? (
          <p className="text-muted">
            New here?{" "}
            <Link className="text-link" href={next === "/projects" ? "/sign-up" : `/sign-up?next=${encodeURIComponent(next)}`}>
              Create an account
            </Link>
          </p>
        ) : null}
      </div>
    </div>
  );
}
