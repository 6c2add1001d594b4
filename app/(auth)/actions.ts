"use server";

import { redirect } from "next/navigation";
import { z } from "zod";
import { actionSignInClient, parseForm, runAction, safeNextPath } from "@/lib/server/actions";
import { requestSignUp, signIn } from "@/lib/server/auth/accounts";
import { confirmPasswordReset, RESET_REQUESTED_MESSAGE, requestPasswordReset } from "@/lib/server/auth/password-reset";
import {
  blankSessionCookie,
  getCurrentSession,
  invalidateSessionToken,
  readSessionTokenFromCookies,
  setSessionCookie,
} from "@/lib/server/auth/session";
import { AppError } from "@/lib/base/errors";
import type { FormState } from "@/lib/base/form-state";
import { acceptInvitation } from "@/lib/server/invitations";
import { signInSchema, signUpSchema } from "@/lib/base/validation/auth";
import { emailSchema, passwordSchema, personNameSchema, tokenSchema } from "@/lib/base/validation/common";

export async function signInAction(_previous: FormState, formData: FormData): Promise<FormState> {
  let next = "/projects";
  const state = await runAction(formData, async (values) => {
    const input = parseForm(signInSchema, values);
    const { cookie, deviceCookie } = await signIn({ ...input, client: await actionSignInClient() });
    await setSessionCookie(cookie);
    await setSessionCookie(deviceCookie);
    next = safeNextPath(values.next);
  });
  if (state.status === "success") redirect(next);
  return state;
}

/** The sign-in page with a message flag and, when there is one, the page to land on afterwards. */
function signInWith(flag: string, next: string): string {
  return next ? `/sign-in?${flag}=1&next=${encodeURIComponent(next)}` : `/sign-in?${flag}=1`;
}

export async function signUpAction(_previous: FormState, formData: FormData): Promise<FormState> {
  let next = "";
  const state = await runAction(formData, async (values) => {
    const input = parseForm(signUpSchema, values);
    await requestSignUp(input);
    next = safeNextPath(values.next, "");
  });
  // The same answer whether or not the address had an account: go and sign in (then on to `next`).
  if (state.status === "success") redirect(signInWith("signed-up", next));
  return state;
}

export async function signOutAction(): Promise<void> {
  await invalidateSessionToken(await readSessionTokenFromCookies());
  await setSessionCookie(blankSessionCookie());
  redirect("/sign-in");
}

export async function requestResetAction(_previous: FormState, formData: FormData): Promise<FormState> {
  return runAction(formData, async (values) => {
    const { email } = parseForm(z.object({ email: emailSchema }), values);
    await requestPasswordReset({ email });
    return { status: "success", message: RESET_REQUESTED_MESSAGE };
  });
}

const resetFormSchema = z
  .object({ token: tokenSchema, password: passwordSchema, confirmPassword: z.string() })
  .refine((value) => value.password === value.confirmPassword, { error: "The two passwords differ.", path: ["confirmPassword"] });

export async function resetPasswordAction(_previous: FormState, formData: FormData): Promise<FormState> {
  const state = await runAction(formData, async (values) => {
    const { token, password } = parseForm(resetFormSchema, values);
    await confirmPasswordReset({ token, password });
  });
  if (state.status === "success") redirect("/sign-in?reset=1");
  return state;
}

const acceptFormSchema = z.object({
  token: tokenSchema,
  name: personNameSchema.optional(),
  password: passwordSchema.optional(),
});

export async function acceptInvitationAction(_previous: FormState, formData: FormData): Promise<FormState> {
  let projectId = "";
  let next = "";
  const state = await runAction(formData, async (values) => {
    next = safeNextPath(values.next, "");
    const cleaned = Object.fromEntries(Object.entries(values).filter(([k, v]) => v !== "" && k !== "next"));
    const input = parseForm(acceptFormSchema, cleaned);
    const { user } = await getCurrentSession();
    const result = await acceptInvitation({ ...input, currentUser: user });
    if (result.signedIn) await setSessionCookie(result.signedIn.cookie);
    projectId = result.projectId;
  });
  if (state.status === "success") {
    if (!projectId) throw new AppError("internal", 500, "Invitation accepted without a project.");
    // a link into the project (a scenario, a sign-off) lands there; otherwise the project's page
    redirect(next && next.startsWith(`/projects/${projectId}`) ? next : `/projects/${projectId}`);
  }
  return state;
}
