import { z } from "zod";

export const notificationsSchema = z.object({ notifySignoff: z.boolean({ error: "Send true or false." }) });
