"use server";

import { revalidatePath } from "next/cache";
import { runInTransaction } from "@/db/client";
import { setSignupMode } from "@/db/queries/settings";
import { assertSiteAdmin } from "@/lib/server/admin";
import { parseForm, runAction } from "@/lib/server/actions";
import { requireUser } from "@/lib/server/auth/session";
import type { FormState } from "@/lib/base/form-state";
import { updateSettingsSchema } from "@/lib/base/validation/admin";

export async function updateSettingsAction(_previous: FormState, formData: FormData): Promise<FormState> {
  return runAction(formData, async (values) => {
    const user = await requireUser();
    assertSiteAdmin(user);
    const { signupMode } = parseForm(updateSettingsSchema, values);
    await runInTransaction((tx) => setSignupMode({ mode: signupMode, actor: user, executor: tx }));
    revalidatePath("/admin/settings");
    return { status: "success", message: signupMode === "open" ? "Anyone can now create an account." : "New accounts now need an invitation." };
  });
}
