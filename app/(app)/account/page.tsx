import type { Metadata } from "next";
import { PageHeader } from "@/components/shell/page-header";
import { Card, CardBody, CardDescription, CardHeader, CardTitle } from "@/components/ui";
import { getSignoffNotifications } from "@/db/queries/signoffs";
import { requireUser } from "@/lib/server/auth/session";
import { NotificationsForm } from "./notifications-form";

export const metadata: Metadata = { title: "Account" };

export default async function AccountPage() {
  const user = await requireUser();
  const notifySignoff = await getSignoffNotifications({ userId: user.id });
  return (
    <div className="flex max-w-2xl flex-col gap-5">
      <PageHeader title="Account" />
      <p className="text-sm">
        Signed in as <strong>{user.name}</strong> ({user.email}).
      </p>
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
    </div>
  );
}
