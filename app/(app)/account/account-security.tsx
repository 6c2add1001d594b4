"use client";

import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";
import { Alert, Button, Field, Input } from "@/components/ui";
import { ApiError, requestJson } from "@/lib/browser/api-client";
import { formatDate } from "@/lib/base/dates";

type Message = { tone: "error" | "success"; text: string; fields?: Record<string, string> } | null;

const failure = (error: unknown, fallback: string): Message =>
  error instanceof ApiError ? { tone: "error", text: error.message, fields: error.fields } : { tone: "error", text: fallback };

/**
 * One request of an account form: busy while it runs, then the success text `work` returns or the
 * server's refusal (with its per-field messages), else `fallback`.
 */
function useAccountRequest(fallback: string) {
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<Message>(null);
  const run = async (work: () => Promise<string>) => {
    setBusy(true);
    setMessage(null);
    try {
      setMessage({ tone: "success", text: await work() });
    } catch (error) {
      setMessage(failure(error, fallback));
    } finally {
      setBusy(false);
    }
  };
  return { busy, message, run };
}

/** The account's name. */
export function ProfileForm({ initialName }: { initialName: string }) {
  const router = useRouter();
  const [name, setName] = useState(initialName);
  const { busy, message, run } = useAccountRequest("The name could not be saved.");
  const submit = (event: FormEvent) => {
    event.preventDefault();
    void run(async () => {
      const result = await requestJson<{ name: string }>("/api/account/profile", { method: "PATCH", json: { name } });
      router.refresh(); // the header shows the name too
      return `Your name is now ${result.name}.`;
    });
  };
  return (
    <form onSubmit={submit} className="flex flex-col gap-3" noValidate>
      <Field label="Name" error={message?.fields?.name}>
        <Input name="name" autoComplete="name" value={name} onChange={(e) => setName(e.target.value)} required />
      </Field>
      <div>
        <Button type="submit" size="sm" loading={busy}>
          Save name
        </Button>
      </div>
      {message && !message.fields?.name ? <Alert tone={message.tone}>{message.text}</Alert> : null}
    </form>
  );
}

/** Move the account to another address: confirmed by a link mailed to that address. */
export function EmailForm({ current }: { current: string }) {
  const { busy, message, run } = useAccountRequest("The change could not be asked for.");
  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const form = event.currentTarget;
    const data = new FormData(form);
    void run(async () => {
      const result = await requestJson<{ pending: string }>("/api/account/email", {
        method: "POST",
        json: { newEmail: String(data.get("newEmail") ?? ""), currentPassword: String(data.get("currentPassword") ?? "") },
      });
      form.reset();
      return `We sent a link to ${result.pending}. Your address stays ${current} until you open it (it expires in 24 hours).`;
    });
  };
  return (
    <form onSubmit={submit} className="flex flex-col gap-3" noValidate>
      <Field label="New e-mail address" error={message?.fields?.newEmail}>
        <Input name="newEmail" type="email" autoComplete="email" required />
      </Field>
      <Field label="Current password" error={message?.fields?.currentPassword}>
        <Input name="currentPassword" type="password" autoComplete="current-password" required />
      </Field>
      <div>
        <Button type="submit" size="sm" loading={busy}>
          Send confirmation link
        </Button>
      </div>
      {message && !message.fields ? <Alert tone={message.tone}>{message.text}</Alert> : null}
    </form>
  );
}

/** Change the password: the current one is asked for; the other sessions end. */
export function PasswordForm() {
  const router = useRouter();
  const { busy, message, run } = useAccountRequest("The password could not be changed.");
  const submit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const form = event.currentTarget;
    const data = new FormData(form);
    void run(async () => {
      const result = await requestJson<{ endedSessions: number }>("/api/account/password", {
        method: "POST",
        json: { currentPassword: String(data.get("currentPassword") ?? ""), newPassword: String(data.get("newPassword") ?? "") },
      });
      form.reset();
      router.refresh();
      return `Password changed. ${result.endedSessions === 0 ? "You had no other sessions." : `${result.endedSessions} other session${result.endedSessions === 1 ? "" : "s"} ended.`}`;
    });
  };
  return (
    <form onSubmit={submit} className="flex flex-col gap-3" noValidate>
      <Field label="Current password" error={message?.fields?.currentPassword}>
        <Input name="currentPassword" type="password" autoComplete="current-password" required />
      </Field>
      <Field label="New password" hint="At least 10 characters, not a common password." error={message?.fields?.newPassword}>
        <Input name="newPassword" type="password" autoComplete="new-password" required minLength={10} />
      </Field>
      <div>
        <Button type="submit" size="sm" loading={busy}>
          Change password
        </Button>
      </div>
      {/* a refusal that names a field is shown at the field only */}
      {message && !message.fields ? <Alert tone={message.tone}>{message.text}</Alert> : null}
    </form>
  );
}

export type SessionRow = { handle: string; createdAt: string | null; expiresAt: string; current: boolean };

/** One's own sessions (browsers signed in to this account), each but this one revocable. */
export function SessionsList({ initial }: { initial: SessionRow[] }) {
  const [rows, setRows] = useState(initial);
  const [ending, setEnding] = useState<string | null>(null);
  const { message, run } = useAccountRequest("The session could not be ended.");
  const revoke = async (handle: string) => {
    setEnding(handle);
    await run(async () => {
      await requestJson(`/api/account/sessions/${handle}`, { method: "DELETE" });
      setRows((r) => r.filter((s) => s.handle !== handle));
      return "That session has ended: the browser is signed out.";
    });
    setEnding(null);
  };
  return (
    <div className="flex flex-col gap-2">
      <ul className="flex flex-col gap-1.5" aria-label="Your sessions">
        {rows.map((s) => (
          <li key={s.handle} className="flex flex-wrap items-center justify-between gap-2 rounded-card border border-rule px-3 py-2 text-sm">
            <span>
              {s.current ? <strong>This browser</strong> : "Another browser"}
              <span className="text-muted">
                {" "}
                · signed in {s.createdAt ? formatDate(s.createdAt) : "before sessions were dated"} · ends {formatDate(s.expiresAt, "day")}
              </span>
            </span>
            {s.current ? null : (
              <Button size="sm" variant="secondary" loading={ending === s.handle} onClick={() => void revoke(s.handle)}>
                Sign out<span className="sr-only"> the session from {s.createdAt ? formatDate(s.createdAt) : "earlier"}</span>
              </Button>
            )}
          </li>
        ))}
      </ul>
      {message ? <Alert tone={message.tone}>{message.text}</Alert> : null}
    </div>
  );
}
