"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { ApiError, requestJson } from "@/lib/browser/api-client";

/** Grant or revoke site admin, after a confirmation that says what it means. */
export function SiteAdminToggle({ userId, name, isSiteAdmin }: { userId: string; name: string; isSiteAdmin: boolean }) {
  const router = useRouter();
  const [confirming, setConfirming] = useState(false);
  const [error, setError] = useState<string | null>(null);
  return (
    <>
      <Button size="sm" variant="ghost" onClick={() => setConfirming(true)}>
        {isSiteAdmin ? "Revoke admin" : "Make admin"}
        <span className="sr-only"> for {name}</span>
      </Button>
      <ConfirmDialog
        open={confirming}
        onClose={() => {
          setError(null);
          setConfirming(false);
        }}
        title={isSiteAdmin ? `Revoke site admin from ${name}?` : `Make ${name} a site admin?`}
        description={
          isSiteAdmin
            ? `${name} will no longer manage accounts and sign-up. Their project roles stay as they are.`
            : `${name} will be able to manage every account (deactivate, grant and revoke site admin) and the sign-up setting. It does not give access to any project.`
        }
        confirmLabel={isSiteAdmin ? "Revoke admin" : "Make admin"}
        tone={isSiteAdmin ? "danger" : "primary"}
        error={error}
        onConfirm={async () => {
          try {
            await requestJson(`/api/admin/users/${userId}`, { method: "PATCH", json: { isSiteAdmin: !isSiteAdmin } });
            setConfirming(false);
            router.refresh();
          } catch (e) {
            setError(e instanceof ApiError ? e.message : "Could not change site admin.");
          }
        }}
      />
    </>
  );
}

/** Deactivate (sessions end at once) or reactivate an account, after a confirmation. */
export function AccountActiveToggle({ userId, name, active }: { userId: string; name: string; active: boolean }) {
  const router = useRouter();
  const [confirming, setConfirming] = useState(false);
  const [error, setError] = useState<string | null>(null);
  return (
    <>
      <Button size="sm" variant="ghost" onClick={() => setConfirming(true)}>
        {active ? "Deactivate" : "Reactivate"}
        <span className="sr-only"> {name}</span>
      </Button>
      <ConfirmDialog
        open={confirming}
        onClose={() => {
          setError(null);
          setConfirming(false);
        }}
        title={active ? `Deactivate ${name}?` : `Reactivate ${name}?`}
        description={
          active
            ? `${name} is signed out everywhere at once and cannot sign in or use API tokens until reactivated. Their projects, memberships and work stay.`
            : `${name} can sign in again with their password.`
        }
        confirmLabel={active ? "Deactivate" : "Reactivate"}
        tone={active ? "danger" : "primary"}
        error={error}
        onConfirm={async () => {
          try {
            await requestJson(`/api/admin/users/${userId}/active`, { method: "PUT", json: { active: !active } });
            setConfirming(false);
            router.refresh();
          } catch (e) {
            setError(e instanceof ApiError ? e.message : "Could not change the account.");
          }
        }}
      />
    </>
  );
}
