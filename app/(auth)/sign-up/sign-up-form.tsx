"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { IDLE } from "@/lib/base/form-state";
import { signUpAction } from "../actions";
import { FormMessage } from "../form-message";

export function SignUpForm({ next }: { next: string }) {
  const [state, action, pending] = useActionState(signUpAction, IDLE);
  return (
    <form action={action} className="flex flex-col gap-4" noValidate>
      <FormMessage state={state} />
      {next ? <input type="hidden" name="next" value={next} /> : null}
      <Field label="Name" error={state.fields?.name}>
        <Input name="name" autoComplete="name" required defaultValue={state.values?.name} />
      </Field>
      <Field label="Email" error={state.fields?.email}>
        <Input name="email" type="email" autoComplete="email" required defaultValue={state.values?.email} />
      </Field>
      <Field label="Password" hint="At least 10 characters, not a common password." error={state.fields?.password}>
        <Input name="password" type="password" autoComplete="new-password" required minLength={10} />
      </Field>
      <Button type="submit" loading={pending} loadingText="Creating account…">
        Create account
      </Button>
    </form>
  );
}
