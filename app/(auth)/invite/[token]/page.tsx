import type { Metadata } from "next";
import Link from "next/link";
import { Alert } from "@/components/ui/alert";
import { getUserByEmail } from "@/db/queries/users";
import { getCurrentSession } from "@/lib/server/auth/session";
import { safeNextPath } from "@/lib/server/actions";
import { findUsableInvitation } from "@/lib/server/invitations";
import { tokenSchema } from "@/lib/base/validation/common";
import { AcceptInvitationForm } from "./accept-invitation-form";

export const metadata: Metadata = { title: "Invitation" };

export default async function InvitationPage({
  params,
  searchParams,
}: {
  params: Promise<{ token: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { token } = await params;
  const query = await searchParams;
  const next = safeNextPath(typeof query.next === "string" ? query.next : null, "");
  const here = next ? `/invite/${token}?next=${encodeURIComponent(next)}` : `/invite/${token}`;
  const invitation = tokenSchema.safeParse(token).success ? await findUsableInvitation({ token }) : null;
  if (!invitation) {
    return (
      <div className="flex flex-col gap-5">
        <h1 className="text-2xl font-semibold">Invitation</h1>
        <Alert tone="error" title="This invitation cannot be used">
          It has expired or was already used. Ask the project owner to invite you again.
        </Alert>
      </div>
    );
  }
  const { user } = await getCurrentSession();
  const hasAccount = !user && (await getUserByEmail({ email: invitation.email })) !== null;
  return (
    <div className="flex flex-col gap-5">
      <div className="flex flex-col gap-1">
        <h1 className="text-2xl font-semibold">Join {invitation.projectName}</h1>
        <p className="text-sm text-muted">
          You are invited as <span className="font-medium text-ink">{invitation.role}</span> ({invitation.email}).
        </p>
      </div>
      {user && user.email.toLowerCase() !== invitation.email.toLowerCase() ? (
        <Alert tone="error" title="This invitation is for someone else">
          You are signed in as {user.email}, but the invitation is for {invitation.email}.{" "}
          <Link className="text-link" href="/sign-out">
            Sign out
          </Link>
          , then sign in as {invitation.email} (or create that account) to accept it.
        </Alert>
      ) : hasAccount ? (
        <Alert tone="info" title="You already have an account">
          <Link className="text-link" href={`/sign-in?next=${encodeURIComponent(here)}`}>
            Sign in as {invitation.email}
          </Link>{" "}
          to accept.
        </Alert>
      ) : (
        <AcceptInvitationForm token={token} signedInAs={user?.email ?? null} next={next} />
      )}
    </div>
  );
}
