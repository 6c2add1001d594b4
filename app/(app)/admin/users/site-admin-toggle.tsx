"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { IDLE } from "@/lib/base/form-state";
import { setSiteAdminAction } from "../actions";

export function SiteAdminToggle({ userId, name, isSiteAdmin }: { userId: string; name: string; isSiteAdmin: boolean }) {
  const [state, action, pending] = useActionState(setSiteAdminAction, IDLE);
  return (
    <form action={action} className="flex items-center gap-2">
      <input type="hidden" name="userId" value={userId} />
      <input type="hidden" name="isSiteAdmin" value={isSiteAdmin ? "false" : "true"} />
      <Button type="submit" size="sm" variant="ghost" loading={pending}>
        {isSiteAdmin ? "Revoke admin" : "Make admin"}
        <span className="sr-only"> for {name}</span>
      </Button>
      {state.status === "error" ? (
        <span role="alert" className="text-xs text-fail-strong">
          {state.message}
        </span>
      ) : null}
    </form>
  );
}
