"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { IDLE } from "@/lib/base/form-state";
import { resetPasswordAction } from "../../actions";
import { FormMessage } from "../../form-message";

export function ResetPasswordForm({ token }: { token: string }) {
  const [state, action, pending] = useActionState(resetPasswordAction, IDLE);
  return (
    <form action={action} className="flex flex-col gap-4" noValidate>
      <FormMessage state={state} />
      <input type="hidden" name="token" value={token} />
      <Field label="New password" hint="At least 10 characters, not a common password. Signing in elsewhere ends when you change it." error={state.fields?.password}>
        <Input name="password" type="password" autoComplete="new-password" required minLength={10} />
      </Field>
      <Field label="Repeat new password" error={state.fields?.confirmPassword}>
        <Input name="confirmPassword" type="password" autoComplete="new-password" required />
      </Field>
      <Button type="submit" loading={pending} loadingText="Saving…">
        Set new password
      </Button>
    </form>
  );
}
