import "server-only";
import { AppError } from "@/lib/base/errors";
import type { SessionUser } from "@/lib/server/auth/session";

/** Site-admin-only operations (users, settings). */
export function assertSiteAdmin(user: SessionUser): void {
  if (!user.isSiteAdmin) throw new AppError("forbidden", 403, "Only site admins can do this.");
}
