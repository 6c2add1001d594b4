import { z } from "zod";
import { emailSchema, nameSchema, roleSchema } from "./common";

const projectNameSchema = nameSchema({ required: "Enter a project name.", max: 120 });

const descriptionSchema = z.string({ error: "The description must be text." }).trim().max(2000, { error: "Use at most 2000 characters." });

export const createProjectSchema = z.object({
  name: projectNameSchema,
  description: descriptionSchema.optional().default(""),
});

export const updateProjectSchema = z
  .object({ name: projectNameSchema.optional(), description: descriptionSchema.optional() })
  .refine((value) => value.name !== undefined || value.description !== undefined, {
    error: "Send a name or a description to change.",
  });

export const inviteMemberSchema = z.object({ email: emailSchema, role: roleSchema });

export const changeRoleSchema = z.object({ role: roleSchema });
