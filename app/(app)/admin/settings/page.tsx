import type { Metadata } from "next";
import { getSignupMode } from "@/db/queries/settings";
import { requireSiteAdmin } from "@/lib/server/auth/session";
import { SettingsForm } from "./settings-form";

export const metadata: Metadata = { title: "Settings" };

export default async function AdminSettingsPage() {
  await requireSiteAdmin();
  return <SettingsForm signupMode={await getSignupMode()} />;
}
