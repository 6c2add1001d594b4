import type { Scenario } from "@/engine/types";

/** What the pages pass to client components (dates as ISO strings, as the API sends them). */
export type ScenarioListItem = {
  id: string;
  name: string;
  revisionNumber: number;
  blockCount: number;
  portNames: string[];
  warningCount: number;
  /** blocks pinning an older part version than the library's latest ("newer version available") */
  blocksBehind?: number;
  updatedAt: string;
  updatedByName: string | null;
};

export type RevisionView = {
  id: string;
  number: number;
  content: Scenario;
  contentHash: string;
  warnings: string[];
  origin: string;
  restoredFrom: number | null;
  authorName: string | null;
  createdAt: string;
};

export type RevisionListItem = Omit<RevisionView, "content">;

export type ScenarioView = { id: string; projectId: string; name: string; latestRevisionId: string; latestRevisionNumber: number };
