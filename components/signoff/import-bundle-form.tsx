"use client";

import { useState } from "react";
import { useRouter } from "next/navigation";
import { ApiError, requestJson } from "@/lib/browser/api-client";
import { Alert, Button, Field, Input } from "@/components/ui";
import { signoffUrls } from "./types";

/** Upload a review bundle (.zip) as a new scenario with its parts (engineers and owners). */
export function ImportBundleForm({ projectId }: { projectId: string }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ tone: "error" | "success"; text: string; href?: string } | null>(null);
  return (
    <form
      aria-label="Import a bundle"
      className="flex flex-col gap-3"
      onSubmit={async (e) => {
        e.preventDefault();
        const form = e.currentTarget;
        const data = new FormData(form);
        const file = data.get("file");
        if (!(file instanceof File) || file.size === 0) {
          setMessage({ tone: "error", text: "Choose a bundle (.zip) to import." });
          return;
        }
        setBusy(true);
        setMessage(null);
        try {
          const result = await requestJson<{ scenario: { id: string; name: string }; parts: { fileName: string; reused: boolean; renamedFrom: string | null }[] }>(signoffUrls.importBundle(projectId), { method: "POST", body: data });
          const renamed = result.parts.filter((p) => p.renamedFrom).map((p) => `${p.renamedFrom} → ${p.fileName}`);
          setMessage({
            tone: "success",
            text: `Imported “${result.scenario.name}”.${renamed.length > 0 ? ` Parts renamed to avoid clashes: ${renamed.join(", ")}.` : ""}`,
            href: `/projects/${projectId}/scenarios/${result.scenario.id}`,
          });
          form.reset();
          router.refresh();
        } catch (error) {
          setMessage({ tone: "error", text: error instanceof ApiError ? error.message : "The bundle could not be imported." });
        } finally {
          setBusy(false);
        }
      }}
    >
      <Field label="Bundle (.zip)" hint="Exported from Portolan; every file is checked against its manifest before anything is stored.">
        <Input type="file" name="file" accept=".zip,application/zip" />
      </Field>
      {message ? (
        <Alert tone={message.tone}>
          {message.text}{" "}
          {message.href ? (
            <a className="underline" href={message.href}>
              Open it
            </a>
          ) : null}
        </Alert>
      ) : null}
      <div>
        <Button type="submit" loading={busy}>
          Import bundle
        </Button>
      </div>
    </form>
  );
}
