import { z } from "zod";
import { emailSchema, nameSchema, roleSchema } from "./common";

const projectNameSchema = nameSchema({ required: "Enter a project name.", max: 120 });

const descriptionSchema = z.string({ error: "The description must be text." }).trim().max(2000, { error: "Use at most 2000 characters." });

export const createProjectSchema = z.object({
  name: projectNameSchema,
  description: descriptionSchema.optional().default(""),
});
export type CreateProjectInput = z.infer<typeof createProjectSchema>;

export const updateProjectSchema = z
  .object({ name: projectNameSchema.optional(), description: descriptionSchema.optional() })
  .refine((value) => value.name !== undefined || value.description !== undefined, {
    error: "Send a name or a description to change.",
  });
export type UpdateProjectInput = z.infer<typeof updateProjectSchema>;

export const deleteProjectSchema = z.object({
  confirmName: z.string({ error: "Type the project name to confirm." }).max(200),
});

export const inviteMemberSchema = z.object({ email: emailSchema, role: roleSchema });
export type InviteMemberInput = z.infer<typeof inviteMemberSchema>;

export const changeRoleSchema = z.object({ role: roleSchema });
export type ChangeRoleInput = z.infer<typeof changeRoleSchema>;
