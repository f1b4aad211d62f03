import type { FileKind } from "./sniff";

/** Shapes the upload API and the entry page send to the browser, shared by the server modules and the components. */

/** A file of a started upload, as the browser needs it to send the parts. */
export interface PlannedFile {
  id: string;
  kind: FileKind;
  filename: string;
  size: number;
  partSize: number;
  partCount: number;
  state: string;
}

/** One finished upload of an entry, with its files' names, sizes and hashes. */
export interface UploadRow {
  id: string;
  number: number;
  state: "complete" | "late";
  completedAt: string;
  counts: boolean;
  /** The crew picked this one as final (rather than it counting as the newest). */
  picked: boolean;
  /** Recorded after the deadline within the organizer's late exception. */
  lateException: boolean;
  repository: { url: string; commit: string } | null;
  licence: string | null;
  files: { kind: string; filename: string; sizeBytes: number; sha256: string; mediaType: string }[];
}
