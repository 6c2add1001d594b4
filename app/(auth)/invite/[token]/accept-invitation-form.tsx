"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { IDLE } from "@/lib/base/form-state";
import { acceptInvitationAction } from "../../actions";
import { FormMessage } from "../../form-message";

/** Signed in: one button links this account. Otherwise: name and password create the account. */
export function AcceptInvitationForm({ token, signedInAs, next }: { token: string; signedInAs: string | null; next: string }) {
  const [state, action, pending] = useActionState(acceptInvitationAction, IDLE);
  return (
    <form action={action} className="flex flex-col gap-4" noValidate>
      <FormMessage state={state} />
      <input type="hidden" name="token" value={token} />
      {next ? <input type="hidden" name="next" value={next} /> : null}
      {signedInAs ? (
        <p className="text-sm">
          Accept as <span className="font-medium">{signedInAs}</span>.
        </p>
      ) : (
        <>
          <Field label="Name" error={state.fields?.name}>
            <Input name="name" autoComplete="name" required defaultValue={state.values?.name} />
          </Field>
          <Field label="Password" hint="At least 10 characters, not a common password." error={state.fields?.password}>
            <Input name="password" type="password" autoComplete="new-password" required minLength={10} />
          </Field>
        </>
      )}
      <Button type="submit" loading={pending} loadingText="Joining…">
        {signedInAs ? "Accept invitation" : "Create account and join"}
      </Button>
    </form>
  );
}
