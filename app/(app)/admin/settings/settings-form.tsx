"use client";

import { useActionState } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { IDLE } from "@/lib/base/form-state";
import type { SignupMode } from "@/lib/base/validation/admin";
import { updateSettingsAction } from "../actions";

const OPTIONS: { value: SignupMode; label: string; hint: string }[] = [
  { value: "open", label: "Open", hint: "Anyone who can reach the site can create an account." },
  { value: "invite", label: "Invitation only", hint: "New accounts are created only by accepting a project invitation." },
];

export function SettingsForm({ signupMode }: { signupMode: SignupMode }) {
  const [state, action, pending] = useActionState(updateSettingsAction, IDLE);
  return (
    <form action={action} className="flex max-w-xl flex-col gap-4">
      {state.message ? <Alert tone={state.status === "error" ? "error" : "success"}>{state.message}</Alert> : null}
      <fieldset className="flex flex-col gap-3">
        <legend className="mb-1 text-sm font-medium">Sign-up</legend>
        {OPTIONS.map((option) => (
          <label key={option.value} className="flex items-start gap-3 rounded-md border border-rule px-3 py-2.5 has-[:checked]:border-ink">
            <input type="radio" name="signupMode" value={option.value} defaultChecked={signupMode === option.value} className="mt-1 accent-ink" />
            <span className="flex flex-col">
              <span className="text-sm font-medium">{option.label}</span>
              <span className="text-xs text-muted">{option.hint}</span>
            </span>
          </label>
        ))}
      </fieldset>
      <div>
        <Button type="submit" loading={pending} loadingText="Saving…">
          Save settings
        </Button>
      </div>
    </form>
  );
}
