/** A sign-off as the browser receives it from GET …/signoffs (dates as ISO strings). */
export type SignoffItem = {
  id: string;
  projectId: string;
  scenarioId: string;
  scenarioName: string;
  revisionId: string;
  revisionNumber: number;
  contentHash: string;
  latestRevisionNumber: number;
  state: "requested" | "approved" | "changes_requested";
  stale: boolean;
  displayState: "requested" | "approved" | "changes_requested" | "stale";
  requestNote: string;
  comment: string;
  /** failing rules waived on approval, each with a reason */
  waiver: { rules: { id: string; reason: string }[] } | null;
  /** the verdict the decision was taken on */
  evidence: { verdict: "pass" | "fail" | "warn"; rulesHash: string; engineVersion: string; failing: string[] } | null;
  requestedBy: { id: string; name: string; email: string } | null;
  reviewer: { id: string; name: string; email: string };
  createdAt: string;
  decidedAt: string | null;
};

export const signoffUrls = {
  list: (projectId: string, scenarioId?: string) => `/api/projects/${projectId}/signoffs${scenarioId ? `?scenarioId=${encodeURIComponent(scenarioId)}` : ""}`,
  decide: (projectId: string, signoffId: string) => `/api/projects/${projectId}/signoffs/${signoffId}/decide`,
  bundle: (projectId: string, scenarioId: string, revisionId?: string) =>
    `/api/projects/${projectId}/scenarios/${scenarioId}/bundle${revisionId ? `?revisionId=${encodeURIComponent(revisionId)}` : ""}`,
  importBundle: (projectId: string) => `/api/projects/${projectId}/bundles`,
  members: (projectId: string) => `/api/projects/${projectId}/members`,
};

export const STATE_LABELS: Record<SignoffItem["displayState"], string> = {
  requested: "Requested",
  approved: "Approved",
  changes_requested: "Changes requested",
  stale: "Stale",
};
