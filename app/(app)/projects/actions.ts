"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { z } from "zod";
import { changeMemberRole, removeMember, revokeInvitation } from "@/db/queries/members";
import { createProject, deleteProject, updateProject } from "@/db/queries/projects";
import { parseForm, runAction } from "@/lib/server/actions";
import { requireUser } from "@/lib/server/auth/session";
import type { FormState } from "@/lib/base/form-state";
import { inviteMember } from "@/lib/server/invitations";
import { idSchema } from "@/lib/base/validation/common";
import { changeRoleSchema, createProjectSchema, inviteMemberSchema, updateProjectSchema } from "@/lib/base/validation/projects";

// Every action validates its input with zod and checks the role on the server (inside the query functions).

export async function createProjectAction(_previous: FormState, formData: FormData): Promise<FormState> {
  let projectId = "";
  const state = await runAction(formData, async (values) => {
    const user = await requireUser();
    const input = parseForm(createProjectSchema, values);
    projectId = (await createProject({ actor: user, name: input.name, description: input.description })).id;
  });
  if (state.status === "success" && projectId) {
    revalidatePath("/projects");
    redirect(`/projects/${projectId}`);
  }
  return state;
}

export async function updateProjectAction(_previous: FormState, formData: FormData): Promise<FormState> {
  return runAction(formData, async (values) => {
    const user = await requireUser();
    const projectId = parseForm(idSchema, values.projectId);
    const input = parseForm(updateProjectSchema, { name: values.name, description: values.description ?? "" });
    await updateProject({ actor: user, projectId, ...input });
    revalidatePath(`/projects/${projectId}`, "layout");
    return { status: "success", message: "Saved." };
  });
}

const deleteSchema = z.object({ projectId: idSchema, confirmName: z.string().max(200) });

export async function deleteProjectAction(input: { projectId: string; confirmName: string }): Promise<FormState> {
  const formData = new FormData();
  formData.set("projectId", input.projectId);
  formData.set("confirmName", input.confirmName);
  const state = await runAction(formData, async (values) => {
    const user = await requireUser();
    const { projectId, confirmName } = parseForm(deleteSchema, values);
    await deleteProject({ actor: user, projectId, confirmName });
  });
  if (state.status === "success") {
    revalidatePath("/projects");
    redirect("/projects");
  }
  return state;
}

export async function inviteMemberAction(_previous: FormState, formData: FormData): Promise<FormState> {
  return runAction(formData, async (values) => {
    const user = await requireUser();
    const projectId = parseForm(idSchema, values.projectId);
    const input = parseForm(inviteMemberSchema, { email: values.email, role: values.role });
    const result = await inviteMember({ actor: user, projectId, email: input.email, role: input.role });
    revalidatePath(`/projects/${projectId}/members`);
    return result.emailSent
      ? { status: "success", message: `Invitation sent to ${result.email}.` }
      : { status: "error", message: `The invitation was saved but the e-mail to ${result.email} could not be sent. Check the SMTP settings.` };
  });
}

export async function changeRoleAction(_previous: FormState, formData: FormData): Promise<FormState> {
  return runAction(formData, async (values) => {
    const user = await requireUser();
    const { projectId, userId } = parseForm(z.object({ projectId: idSchema, userId: idSchema }), values);
    const { role } = parseForm(changeRoleSchema, { role: values.role });
    await changeMemberRole({ actor: user, projectId, userId, role });
    revalidatePath(`/projects/${projectId}`, "layout");
    return { status: "success", message: "Role changed." };
  });
}

export async function removeMemberAction(input: { projectId: string; userId: string }): Promise<FormState> {
  const formData = new FormData();
  formData.set("projectId", input.projectId);
  formData.set("userId", input.userId);
  let left = false;
  const state = await runAction(formData, async (values) => {
    const user = await requireUser();
    const { projectId, userId } = parseForm(z.object({ projectId: idSchema, userId: idSchema }), values);
    await removeMember({ actor: user, projectId, userId });
    left = userId === user.id;
    revalidatePath(`/projects/${projectId}`, "layout");
  });
  if (state.status === "success" && left) redirect("/projects");
  return state;
}

export async function revokeInvitationAction(input: { projectId: string; invitationId: string }): Promise<FormState> {
  const formData = new FormData();
  formData.set("projectId", input.projectId);
  formData.set("invitationId", input.invitationId);
  return runAction(formData, async (values) => {
    const user = await requireUser();
    const { projectId, invitationId } = parseForm(z.object({ projectId: idSchema, invitationId: idSchema }), values);
    await revokeInvitation({ actor: user, projectId, invitationId });
    revalidatePath(`/projects/${projectId}/members`);
  });
}
