import { Alert } from "@/components/ui/alert";
import type { FormState } from "@/lib/base/form-state";

/** The form-level message of a server action's answer (field messages sit under each field). */
export function FormMessage({ state }: { state: FormState }) {
  if (!state.message) return null;
  return <Alert tone={state.status === "error" ? "error" : "success"}>{state.message}</Alert>;
}
