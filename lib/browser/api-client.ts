/**
 * The browser's one API client: every fetch of a route handler goes through `requestJson`, which turns
 * the `{ error: { code, message, fields? } }` bodies of lib/server/api.ts into an ApiError with the
 * status, code and message a person can act on. The URL builders of the routes the pages call are here
 * too.
 */

export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fields?: Record<string, string>;
  /** the whole JSON body (a 409 carries `current` or `scenarios`) */
  readonly body: unknown;
  constructor(status: number, code: string, message: string, body: unknown, fields?: Record<string, string>) {
    super(message);
    this.name = "ApiError";
    this.status = status;
    this.code = code;
    this.body = body;
    this.fields = fields;
  }
}

/** fetch + JSON with errors as ApiError; a 204 gives undefined. */
export async function requestJson<T>(url: string, init: RequestInit & { json?: unknown } = {}): Promise<T> {
  const { json, headers, ...rest } = init;
  const response = await fetch(url, {
    ...rest,
    headers: { accept: "application/json", ...(json !== undefined ? { "content-type": "application/json" } : {}), ...headers },
    body: json !== undefined ? JSON.stringify(json) : rest.body,
    credentials: "same-origin",
  });
  if (response.status === 204) return undefined as T;
  let body: unknown = null;
  try {
    body = await response.json();
  } catch {
    body = null;
  }
  if (!response.ok) {
    const error = (body as { error?: { code?: string; message?: string; fields?: Record<string, string> } } | null)?.error;
    throw new ApiError(response.status, error?.code ?? "error", error?.message ?? `The server answered ${response.status}.`, body, error?.fields);
  }
  return body as T;
}

/** SWR fetcher. */
export const fetchJson = <T>(url: string): Promise<T> => requestJson<T>(url);

export const scenarioUrls = {
  list: (projectId: string) => `/api/projects/${projectId}/scenarios`,
  one: (projectId: string, scenarioId: string) => `/api/projects/${projectId}/scenarios/${scenarioId}`,
  revisions: (projectId: string, scenarioId: string) => `/api/projects/${projectId}/scenarios/${scenarioId}/revisions`,
  draft: (projectId: string, scenarioId: string) => `/api/projects/${projectId}/scenarios/${scenarioId}/draft`,
  restore: (projectId: string, scenarioId: string, revisionId: string) => `/api/projects/${projectId}/scenarios/${scenarioId}/revisions/${revisionId}/restore`,
  duplicate: (projectId: string, scenarioId: string) => `/api/projects/${projectId}/scenarios/${scenarioId}/duplicate`,
  solve: (projectId: string, scenarioId: string, format: "json" | "touchstone" | "csv", revisionId?: string) =>
    `/api/projects/${projectId}/scenarios/${scenarioId}/solve?format=${format}${revisionId ? `&revision=${encodeURIComponent(revisionId)}` : ""}`,
  parts: (projectId: string, withText = false) => `/api/projects/${projectId}/parts${withText ? "?text=1" : ""}`,
  part: (projectId: string, partId: string) => `/api/projects/${projectId}/parts/${partId}`,
  partVersions: (projectId: string, partId: string) => `/api/projects/${projectId}/parts/${partId}/versions`,
};

export const checkRunUrls = {
  list: (projectId: string, scenarioId: string) => `/api/projects/${projectId}/scenarios/${scenarioId}/check-runs`,
  one: (projectId: string, scenarioId: string, runId: string) => `/api/projects/${projectId}/scenarios/${scenarioId}/check-runs/${runId}`,
  worstSample: (projectId: string, scenarioId: string, runId: string) => `/api/projects/${projectId}/scenarios/${scenarioId}/check-runs/${runId}/worst-sample`,
};

export const jobUrls = {
  one: (projectId: string, jobId: string) => `/api/projects/${projectId}/jobs/${jobId}`,
  storage: (projectId: string, scenarioId: string) => `/api/projects/${projectId}/scenarios/${scenarioId}/check-runs/storage`,
};
