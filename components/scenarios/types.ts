import type { Scenario } from "@/engine/types";

/** What the pages pass to client components (dates as ISO strings, as the API sends them). */
export type ScenarioListItem = {
  id: string;
  name: string;
  revisionNumber: number;
  blockCount: number;
  portNames: string[];
  warningCount: number;
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

export type PartView = {
  id: string;
  name: string;
  fileName: string;
  ports: number;
  version: string;
  points: number;
  startHz: number;
  stopHz: number;
  sizeBytes: number;
  referenceOhms: [number, number][];
  maxSingular: number;
  maxSingularHz: number;
  reciprocityError: number;
  reciprocityHz: number;
  passivity: "pass" | "fail";
  reciprocity: "pass" | "warn";
  /** the data shows gain: an active part (not expected passive), with the reason */
  active: boolean;
  activeReason: string | null;
  preview: { label: string; hz: number[]; db: number[] };
  createdAt: string;
  text?: string;
};

/** Date → ISO string for props of client components, recursively for plain objects and arrays. */
export function serialiseDates<T>(value: T): T {
  if (value instanceof Date) return value.toISOString() as unknown as T;
  if (Array.isArray(value)) return value.map((v) => serialiseDates(v)) as unknown as T;
  if (value && typeof value === "object") {
    return Object.fromEntries(Object.entries(value as Record<string, unknown>).map(([k, v]) => [k, serialiseDates(v)])) as T;
  }
  return value;
}
