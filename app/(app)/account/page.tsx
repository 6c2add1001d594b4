import type { Metadata } from "next";
import { PageHeader } from "@/components/shell/page-header";
import { Card, CardBody, CardDescription, CardHeader, CardTitle } from "@/components/ui";
import { listProjectsForUser } from "@/db/queries/projects";
import { getSignoffNotifications } from "@/db/queries/signoffs";
import { listApiTokens } from "@/lib/server/auth/api-tokens";
import { requireUser } from "@/lib/server/auth/session";
import { ApiTokensSection } from "./api-tokens-section";
import { NotificationsForm } from "./notifications-form";
import { EmailForm, PasswordForm, ProfileForm, SessionsList } from "./account-security";
import { listOwnSessions } from "@/lib/server/account";
import { getCurrentSession } from "@/lib/server/auth/session";

export const metadata: Metadata = { title: "Account" };

export default async function AccountPage() {
  const user = await requireUser();
  const { session } = await getCurrentSession();
  const [notifySignoff, tokens, projects, sessions] = await Promise.all([
    getSignoffNotifications({ userId: user.id }),
    listApiTokens({ userId: user.id }),
    listProjectsForUser({ userId: user.id }),
    listOwnSessions({ userId: user.id, currentSessionId: session?.id ?? null }),
  ]);
  return (
    <div className="flex max-w-2xl flex-col gap-5">
      <PageHeader title="Account" />
      <p className="text-sm">
        Signed in as <strong>{user.name}</strong> ({user.email}).
      </p>
      <Card aria-labelledby="profile-heading">
        <CardHeader>
          <div>
            <CardTitle id="profile-heading">Name</CardTitle>
            <CardDescription>Shown to the members of your projects, in the audit log and on sign-offs.</CardDescription>
          </div>
        </CardHeader>
        <CardBody>
          <ProfileForm initialName={user.name} />
        </CardBody>
      </Card>
      <Card aria-labelledby="email-heading">
        <CardHeader>
          <div>
            <CardTitle id="email-heading">E-mail address</CardTitle>
            <CardDescription>Now {user.email}. A new address is used once you open the link we send to it.</CardDescription>
          </div>
        </CardHeader>
        <CardBody>
          <EmailForm current={user.email} />
        </CardBody>
      </Card>
      <Card aria-labelledby="password-heading">
        <CardHeader>
          <div>
            <CardTitle id="password-heading">Password</CardTitle>
            <CardDescription>Changing it signs out every other browser signed in to this account.</CardDescription>
          </div>
        </CardHeader>
        <CardBody>
          <PasswordForm />
        </CardBody>
      </Card>
      <Card aria-labelledby="sessions-heading">
        <CardHeader>
          <div>
            <CardTitle id="sessions-heading">Sessions</CardTitle>
            <CardDescription>Browsers signed in to this account. Sign out any you do not recognise.</CardDescription>
          </div>
        </CardHeader>
        <CardBody>
          <SessionsList initial={sessions} />
        </CardBody>
      </Card>
      <Card aria-labelledby="notifications-heading">
        <CardHeader>
          <div>
            <CardTitle id="notifications-heading">Notifications</CardTitle>
            <CardDescription>Invitations and password resets are always e-mailed; sign-off e-mails can be turned off.</CardDescription>
          </div>
        </CardHeader>
        <CardBody>
          <NotificationsForm initial={notifySignoff} />
        </CardBody>
      </Card>
      <Card aria-labelledby="api-tokens-heading">
        <CardHeader>
          <div>
            <CardTitle id="api-tokens-heading">API tokens</CardTitle>
            <CardDescription>
              For scripts and CI pipelines: send <code className="font-mono">Authorization: Bearer &lt;token&gt;</code> to the project API. A token reaches only the
              projects you choose, never more than your role there, and never your account or other tokens.
            </CardDescription>
          </div>
        </CardHeader>
        <CardBody>
          <ApiTokensSection
            initialTokens={tokens.map((t) => ({
              ...t,
              expiresAt: t.expiresAt.toISOString(),
              lastUsedAt: t.lastUsedAt?.toISOString() ?? null,
              revokedAt: t.revokedAt?.toISOString() ?? null,
            }))}
            projects={projects.map((p) => ({ id: p.id, name: p.name, role: p.role }))}
          />
        </CardBody>
      </Card>
    </div>
  );
}
