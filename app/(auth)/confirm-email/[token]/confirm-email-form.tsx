"use client";

import Link from "next/link";
import { useState } from "react";
import { Alert, Button } from "@/components/ui";
import { ApiError, requestJson } from "@/lib/browser/api-client";

/** One button: mail scanners open links, so the change waits for a person's click (a POST). */
export function ConfirmEmailForm({ token }: { token: string }) {
  const [busy, setBusy] = useState(false);
  const [result, setResult] = useState<{ tone: "success" | "error"; text: string } | null>(null);
  if (result?.tone === "success") {
    return (
      <Alert tone="success" title="Address changed">
        {result.text}{" "}
        <Link className="text-link" href="/account">
          Go to your account
        </Link>
      </Alert>
    );
  }
  return (
    <div className="flex flex-col gap-3">
      <Button
        loading={busy}
        onClick={async () => {
          setBusy(true);
          try {
            const { email } = await requestJson<{ email: string }>("/api/auth/email-change/confirm", { method: "POST", json: { token } });
            setResult({ tone: "success", text: `Your account now uses ${email}; sign in with it from now on.` });
          } catch (e) {
            setResult({ tone: "error", text: e instanceof ApiError ? e.message : "The address could not be changed." });
          } finally {
            setBusy(false);
          }
        }}
      >
        Confirm new address
      </Button>
      {result ? <Alert tone="error">{result.text}</Alert> : null}
    </div>
  );
}
