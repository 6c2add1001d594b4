import type { Metadata } from "next";
import Link from "next/link";
import { Alert } from "@/components/ui/alert";
import { isResetTokenUsable } from "@/lib/server/auth/password-reset";
import { tokenSchema } from "@/lib/base/validation/common";
import { ResetPasswordForm } from "./reset-password-form";

export const metadata: Metadata = { title: "Choose a new password" };

export default async function ResetPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const usable = tokenSchema.safeParse(token).success && (await isResetTokenUsable({ token }));
  return (
    <div className="flex flex-col gap-5">
      <h1 className="text-2xl font-semibold">Choose a new password</h1>
      {usable ? (
        <ResetPasswordForm token={token} />
      ) : (
        <Alert tone="error" title="This link cannot be used">
          It has expired or was already used.{" "}
          <Link className="text-link" href="/forgot-password">
            Ask for a new link
          </Link>
          .
        </Alert>
      )}
    </div>
  );
}
