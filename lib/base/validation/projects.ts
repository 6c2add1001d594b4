import { z } from "zod";
import { emailSchema, roleSchema } from "./common";

const projectNameSchema = z
  .string({ error: "Enter a project name." })
  .trim()
  .min(1, { error: "Enter a project name." })
  .max(120, { error: "Use at most 120 characters." });

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
