import type { Metadata } from "next";
import Link from "next/link";
import { ForgotPasswordForm } from "./forgot-password-form";

export const metadata: Metadata = { title: "Forgot password" };

export default function ForgotPasswordPage() {
  return (
    <div className="flex flex-col gap-5">
      <div className="flex flex-col gap-1">
        <h1 className="text-2xl font-semibold">Forgot your password?</h1>
        <p className="text-sm text-muted">Enter your e-mail address and we will send you a link to choose a new password.</p>
      </div>
      <ForgotPasswordForm />
      <Link className="text-link text-sm" href="/sign-in">
        Back to sign in
      </Link>
    </div>
  );
}
