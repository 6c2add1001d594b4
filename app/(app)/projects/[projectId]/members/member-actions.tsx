"use client";

import { useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { Select } from "@/components/ui/select";
import type { Role } from "@/lib/base/permission-table";
import { IDLE } from "@/lib/base/form-state";
import { changeRoleAction, removeMemberAction, revokeInvitationAction } from "../../actions";
import { ROLE_OPTIONS } from "./role-options";

/** An owner's controls for one member: change role, remove. The server refuses to drop the last owner. */
export function MemberActions({
  projectId,
  userId,
  name,
  role,
  isSelf,
  lastOwner = false,
}: {
  projectId: string;
  userId: string;
  name: string;
  role: Role;
  isSelf: boolean;
  /** the project's only owner: leaving or removing is not offered (a project keeps an owner) */
  lastOwner?: boolean;
}) {
  const [state, action, pending] = useActionState(changeRoleAction, IDLE);
  const [confirming, setConfirming] = useState(false);
  const [removeError, setRemoveError] = useState<string | null>(null);
  const selectId = `role-${userId}`;
  return (
    <div className="flex flex-col gap-1.5">
      <div className="flex flex-wrap items-center gap-2">
        <form action={action} className="flex items-center gap-2">
          <input type="hidden" name="projectId" value={projectId} />
          <input type="hidden" name="userId" value={userId} />
          <label htmlFor={selectId} className="sr-only">
            Role of {name}
          </label>
          <Select id={selectId} name="role" defaultValue={role} options={ROLE_OPTIONS} className="h-8 w-32" />
          <Button type="submit" size="sm" variant="secondary" loading={pending}>
            Save
          </Button>
        </form>
        {lastOwner ? (
          <span className="text-xs text-muted">Only owner: make someone else owner to {isSelf ? "leave" : "remove"}</span>
        ) : (
          <Button size="sm" variant="ghost" onClick={() => setConfirming(true)}>
            {isSelf ? "Leave" : "Remove"}
            <span className="sr-only"> {name}</span>
          </Button>
        )}
      </div>
      {state.message ? (
        <p role={state.status === "error" ? "alert" : "status"} className={state.status === "error" ? "text-xs text-fail-strong" : "text-xs text-pass-strong"}>
          {state.message}
        </p>
      ) : null}
      <ConfirmDialog
        open={confirming}
        onClose={() => {
          setRemoveError(null);
          setConfirming(false);
        }}
        title={isSelf ? "Leave this project?" : `Remove ${name}?`}
        description={isSelf ? "You lose access until an owner invites you again." : `${name} loses access to the project. You can invite them again later.`}
        confirmLabel={isSelf ? "Leave" : "Remove"}
        error={removeError}
        onConfirm={async () => {
          const result = await removeMemberAction({ projectId, userId });
          if (result.status === "error") setRemoveError(result.message ?? "Could not remove.");
          else setConfirming(false);
        }}
      />
    </div>
  );
}

export function RevokeInvitationButton({ projectId, invitationId, email }: { projectId: string; invitationId: string; email: string }) {
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  return (
    <div className="flex items-center gap-2">
      <Button
        size="sm"
        variant="ghost"
        loading={pending}
        onClick={async () => {
          setPending(true);
          const result = await revokeInvitationAction({ projectId, invitationId });
          setPending(false);
          setError(result.status === "error" ? (result.message ?? "Could not revoke.") : null);
        }}
      >
        Revoke<span className="sr-only"> invitation for {email}</span>
      </Button>
      {error ? (
        <span role="alert" className="text-xs text-fail-strong">
          {error}
        </span>
      ) : null}
    </div>
  );
}
