"use client";

import { useState } from "react";
import { ApiError, requestJson } from "@/lib/browser/api-client";
import { Alert } from "@/components/ui";

/** The sign-off e-mail toggle; saved as soon as it changes. */
export function NotificationsForm({ initial }: { initial: boolean }) {
  const [enabled, setEnabled] = useState(initial);
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ tone: "error" | "success"; text: string } | null>(null);
  const change = async (next: boolean) => {
    setBusy(true);
    setMessage(null);
    try {
      const result = await requestJson<{ notifySignoff: boolean }>("/api/account/notifications", { method: "PATCH", json: { notifySignoff: next } });
      setEnabled(result.notifySignoff);
      setMessage({ tone: "success", text: result.notifySignoff ? "Sign-off e-mails are on." : "Sign-off e-mails are off." });
    } catch (error) {
      setMessage({ tone: "error", text: error instanceof ApiError ? error.message : "The setting could not be saved." });
    } finally {
      setBusy(false);
    }
  };
  return (
    <div className="flex flex-col gap-2">
      <label className="inline-flex items-center gap-2 text-sm">
        <input type="checkbox" checked={enabled} disabled={busy} onChange={(e) => void change(e.target.checked)} />
        E-mail me about sign-offs (requests addressed to me, and decisions on my requests)
      </label>
      {message ? <Alert tone={message.tone}>{message.text}</Alert> : null}
    </div>
  );
}
