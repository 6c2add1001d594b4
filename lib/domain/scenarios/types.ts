import type { Scenario } from "@/engine/types";
import type { RevisionChangeSummary } from "./summary";

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
  /** the author's note on a deliberate save */
  note: string | null;
  /** what changed against the previous revision (null on revisions older than the column) */
  summary: RevisionChangeSummary | null;
  /** for a save merged with later revisions: the newest one's number */
  mergedWith: number | null;
  createdAt: string;
};

/** A person's working draft of a scenario as the drafts route returns it. */
export type ScenarioDraftView = { baseRevisionId: string; baseNumber: number; content: Scenario; updatedAt: string };

export type RevisionListItem = Omit<RevisionView, "content">;

export type ScenarioView = { id: string; projectId: string; name: string; latestRevisionId: string; latestRevisionNumber: number };
