"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { IDLE } from "@/lib/base/form-state";
import { requestResetAction } from "../actions";
import { FormMessage } from "../form-message";

export function ForgotPasswordForm() {
  const [state, action, pending] = useActionState(requestResetAction, IDLE);
  return (
    <form action={action} className="flex flex-col gap-4" noValidate>
      <FormMessage state={state} />
      <Field label="Email" error={state.fields?.email}>
        <Input name="email" type="email" autoComplete="email" required defaultValue={state.values?.email} />
      </Field>
      <Button type="submit" loading={pending} loadingText="Sending…">
        Send reset link
      </Button>
    </form>
  );
}
