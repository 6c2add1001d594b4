"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { IDLE } from "@/lib/base/form-state";
import { signInAction } from "../actions";
import { FormMessage } from "../form-message";

export function SignInForm({ next }: { next: string }) {
  const [state, action, pending] = useActionState(signInAction, IDLE);
  return (
    <form action={action} className="flex flex-col gap-4" noValidate>
      <FormMessage state={state} />
      <input type="hidden" name="next" value={next} />
      <Field label="Email" error={state.fields?.email && state.fields.email !== state.message ? state.fields.email : undefined}>
        <Input name="email" type="email" autoComplete="username" required defaultValue={state.values?.email} autoFocus />
      </Field>
      <Field label="Password" error={state.fields?.password}>
        <Input name="password" type="password" autoComplete="current-password" required />
      </Field>
      <Button type="submit" loading={pending} loadingText="Signing in…">
        Sign in
      </Button>
    </form>
  );
}
