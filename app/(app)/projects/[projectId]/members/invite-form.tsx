"use client";

import { useActionState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Select } from "@/components/ui/select";
import { IDLE } from "@/lib/base/form-state";
import { inviteMemberAction } from "../../actions";
import { ROLE_OPTIONS } from "./role-options";

export function InviteForm({ projectId }: { projectId: string }) {
  const [state, action, pending] = useActionState(inviteMemberAction, IDLE);
  return (
    <form action={action} className="flex flex-col gap-4" noValidate key={state.status === "success" ? state.message : "form"}>
      {state.message ? <Alert tone={state.status === "error" ? "error" : "success"}>{state.message}</Alert> : null}
      <input type="hidden" name="projectId" value={projectId} />
      <Field label="Email" error={state.fields?.email}>
        <Input name="email" type="email" required defaultValue={state.status === "error" ? state.values?.email : undefined} />
      </Field>
      <Field label="Role" hint="Reviewers read, run checks, export and sign off; engineers also edit; owners also manage members." error={state.fields?.role}>
        <Select name="role" defaultValue={state.values?.role ?? "engineer"} options={ROLE_OPTIONS} />
      </Field>
      <Button type="submit" loading={pending} loadingText="Sending…">
        Send invitation
      </Button>
    </form>
  );
}
