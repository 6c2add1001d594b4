import type { PartPreview, PartVerdicts } from "./figures";

/** A part as the pages pass it to client components (dates as ISO strings). */
export type PartView = PartVerdicts & {
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
  preview: PartPreview;
  createdAt: string;
  text?: string;
};
