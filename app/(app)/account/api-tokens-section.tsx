"use client";

import { useState, type FormEvent } from "react";
import { ApiError, requestJson } from "@/lib/browser/api-client";
import { Alert, Badge, Button, Field, Input, Select, Table, TBody, THead, Td, Th, Tr } from "@/components/ui";

export type TokenRow = {
  id: string;
  name: string;
  prefix: string;
  projects: { id: string; name: string }[];
  roleCeiling: "owner" | "engineer" | "reviewer" | "read";
  expiresAt: string;
  lastUsedAt: string | null;
  revokedAt: string | null;
};

export type TokenProjectOption = { id: string; name: string; role: string };

const dateFormat = new Intl.DateTimeFormat("en-GB", { dateStyle: "medium" });

const CEILINGS = [
  { value: "read", label: "Read only (reads scenarios, parts, rules, check runs, bundles)" },
  { value: "reviewer", label: "Up to reviewer (also runs checks, signs off)" },
  { value: "engineer", label: "Up to engineer (also edits)" },
  { value: "owner", label: "Up to owner (everything your role allows)" },
];

const LIFETIMES = [
  { value: "7", label: "7 days" },
  { value: "30", label: "30 days" },
  { value: "90", label: "90 days" },
  { value: "365", label: "1 year" },
];

function stateOf(token: TokenRow, now: number): { label: string; tone: "neutral" | "fail" | "pass" } {
  if (token.revokedAt) return { label: "revoked", tone: "fail" };
  if (new Date(token.expiresAt).getTime() <= now) return { label: "expired", tone: "neutral" };
  return { label: "active", tone: "pass" };
}

/** Personal API tokens: create (shown once), list, revoke. The server stores only a hash. */
export function ApiTokensSection({ initialTokens, projects }: { initialTokens: TokenRow[]; projects: TokenProjectOption[] }) {
  const [tokens, setTokens] = useState(initialTokens);
  const [created, setCreated] = useState<{ name: string; token: string } | null>(null);
  const [error, setError] = useState<{ message: string; fields?: Record<string, string> } | null>(null);
  const [busy, setBusy] = useState(false);
  const [now] = useState(() => Date.now());

  const create = async (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    setBusy(true);
    setError(null);
    setCreated(null);
    try {
      const result = await requestJson<{ token: string; apiToken: TokenRow }>("/api/account/tokens", {
        method: "POST",
        json: {
          name: form.get("name"),
          expiresInDays: Number(form.get("expiresInDays")),
          roleCeiling: form.get("roleCeiling"),
          projectIds: form.getAll("projectIds"),
        },
      });
      setCreated({ name: result.apiToken.name, token: result.token });
      setTokens((list) => [result.apiToken, ...list]);
      (event.target as HTMLFormElement).reset();
    } catch (caught) {
      setError(caught instanceof ApiError ? { message: caught.message, fields: caught.fields } : { message: "The token could not be created." });
    } finally {
      setBusy(false);
    }
  };

  const revoke = async (token: TokenRow) => {
    setError(null);
    try {
      await requestJson<void>(`/api/account/tokens/${encodeURIComponent(token.id)}`, { method: "DELETE" });
      setTokens((list) => list.map((t) => (t.id === token.id ? { ...t, revokedAt: new Date().toISOString() } : t)));
    } catch (caught) {
      setError({ message: caught instanceof ApiError ? caught.message : "The token could not be revoked." });
    }
  };

  return (
    <div className="flex flex-col gap-4">
      {created ? (
        <Alert tone="success">
          <div className="flex flex-col gap-1.5">
            <span>
              Copy the token <strong>{created.name}</strong> now: it is shown only this once.
            </span>
            <code data-testid="new-api-token" className="break-all rounded bg-sunken px-2 py-1 font-mono text-xs select-all">
              {created.token}
            </code>
          </div>
        </Alert>
      ) : null}
      {error ? <Alert tone="error">{error.message}</Alert> : null}
      {projects.length === 0 ? (
        <p className="text-sm text-muted">A token reaches projects you are a member of; you have none yet.</p>
      ) : (
        <form className="flex flex-col gap-3" onSubmit={(event) => void create(event)} aria-label="Create an API token">
          <Field label="Token name" hint="What uses it, e.g. the CI pipeline of the Kestrel repository." error={error?.fields?.name}>
            <Input name="name" required maxLength={80} />
          </Field>
          <fieldset className="flex flex-col gap-1 text-sm">
            <legend className="mb-1 font-medium">Projects</legend>
            {projects.map((project) => (
              <label key={project.id} className="inline-flex items-center gap-2">
                <input type="checkbox" name="projectIds" value={project.id} /> {project.name} <span className="text-muted">(you: {project.role})</span>
              </label>
            ))}
            {error?.fields?.projectIds ? <span className="text-fail">{error.fields.projectIds}</span> : null}
          </fieldset>
          <div className="grid gap-3 sm:grid-cols-2">
            <Field label="At most" hint="Never more than your own role in each project." error={error?.fields?.roleCeiling}>
              <Select name="roleCeiling" defaultValue="read" options={CEILINGS} />
            </Field>
            <Field label="Expires after" error={error?.fields?.expiresInDays}>
              <Select name="expiresInDays" defaultValue="30" options={LIFETIMES} />
            </Field>
          </div>
          <div>
            <Button type="submit" disabled={busy}>
              Create token
            </Button>
          </div>
        </form>
      )}
      {tokens.length > 0 ? (
        <Table>
          <THead>
            <Tr>
              <Th>Name</Th>
              <Th>Reaches</Th>
              <Th>Expires</Th>
              <Th>State</Th>
              <Th>
                <span className="sr-only">Actions</span>
              </Th>
            </Tr>
          </THead>
          <TBody>
            {tokens.map((token) => {
              const state = stateOf(token, now);
              return (
                <Tr key={token.id}>
                  <Td>
                    {token.name}
                    <div className="font-mono text-xs text-muted">{token.prefix}…</div>
                  </Td>
                  <Td>
                    {token.projects.map((p) => p.name).join(", ") || "—"}
                    <div className="text-xs text-muted">{token.roleCeiling === "read" ? "read only" : `up to ${token.roleCeiling}`}</div>
                  </Td>
                  <Td>{dateFormat.format(new Date(token.expiresAt))}</Td>
                  <Td>
                    <Badge tone={state.tone}>{state.label}</Badge>
                  </Td>
                  <Td>
                    {state.label === "active" ? (
                      <Button variant="secondary" size="sm" onClick={() => void revoke(token)} aria-label={`Revoke ${token.name}`}>
                        Revoke
                      </Button>
                    ) : null}
                  </Td>
                </Tr>
              );
            })}
          </TBody>
        </Table>
      ) : null}
    </div>
  );
}
