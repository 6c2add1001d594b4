"use client";

import { useActionState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Textarea } from "@/components/ui/textarea";
import { IDLE } from "@/lib/base/form-state";
import { updateProjectAction } from "../actions";

export function ProjectSettingsForm({ projectId, name, description }: { projectId: string; name: string; description: string }) {
  const [state, action, pending] = useActionState(updateProjectAction, IDLE);
  return (
    <form action={action} className="flex flex-col gap-4" noValidate>
      {state.message ? <Alert tone={state.status === "error" ? "error" : "success"}>{state.message}</Alert> : null}
      <input type="hidden" name="projectId" value={projectId} />
      <Field label="Project name" error={state.fields?.name}>
        <Input name="name" required maxLength={120} defaultValue={state.values?.name ?? name} />
      </Field>
      <Field label="Description" error={state.fields?.description}>
        <Textarea name="description" rows={4} maxLength={2000} defaultValue={state.values?.description ?? description} />
      </Field>
      <Button type="submit" variant="secondary" loading={pending} loadingText="Saving…">
        Save changes
      </Button>
    </form>
  );
}
