"use client";

import { useActionState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Textarea } from "@/components/ui/textarea";
import { IDLE } from "@/lib/base/form-state";
import { createProjectAction } from "./actions";

export function CreateProjectForm() {
  const [state, action, pending] = useActionState(createProjectAction, IDLE);
  return (
    <form action={action} className="flex flex-col gap-4" noValidate>
      {state.status === "error" && state.message ? <Alert tone="error">{state.message}</Alert> : null}
      <Field label="Project name" error={state.fields?.name}>
        <Input name="name" required maxLength={120} defaultValue={state.values?.name} />
      </Field>
      <Field label="Description" hint="Optional: what the front end is and what must be proved." error={state.fields?.description}>
        <Textarea name="description" rows={3} maxLength={2000} defaultValue={state.values?.description} />
      </Field>
      <Button type="submit" loading={pending} loadingText="Creating…">
        Create project
      </Button>
    </form>
  );
}
