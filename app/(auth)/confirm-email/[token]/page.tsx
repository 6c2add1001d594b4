import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { tokenSchema } from "@/lib/base/validation/common";
import { ConfirmEmailForm } from "./confirm-email-form";

export const metadata: Metadata = { title: "Confirm your new address" };

export default async function ConfirmEmailPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  if (!tokenSchema.safeParse(token).success) notFound();
  return (
    <div className="flex flex-col gap-5">
      <div className="flex flex-col gap-1">
        <h1 className="text-2xl font-semibold">Confirm your new address</h1>
        <p className="text-sm text-muted">Your Portolan account moves to the address this link was sent to.</p>
      </div>
      <ConfirmEmailForm token={token} />
    </div>
  );
}
