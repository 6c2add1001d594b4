import type { PartPreview, PartVerdicts } from "./figures";

/** A part as the pages pass it to client components (dates as ISO strings). */
export type PartView = PartVerdicts & {
  id: string;
  name: string;
  fileName: string;
  /** this row's version of the file (1, 2, 3…); in the list, the latest */
  partVersion: number;
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
  preview: PartPreview;
  createdAt: string;
  text?: string;
  /** in the list: every version of the file, oldest first, with its row id */
  versions?: { id: string; partVersion: number }[];
  /** in the list: texts of older versions asked for, keyed as blocks pin them (pinnedPartPath) */
  pinnedTexts?: Record<string, string>;
};

/** One version of a part on its page (figures stored at upload; no text). */
export type PartVersionView = Omit<PartView, "preview" | "text" | "versions" | "pinnedTexts"> & { uploadedByName: string | null };

/** A block of a scenario's latest revision that uses a part file, with the version it pins. */
export type PartUseView = { scenarioId: string; scenarioName: string; blockId: string; partVersion: number };
