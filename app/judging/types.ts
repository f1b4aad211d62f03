import type { ScaleCriterion } from "./sheet";

/** What one judge's scoring grid shows (shared by the grid service and the grid component). */
export interface GridCell {
  value: number | null;
  version: number;
}

export interface GridRow {
  entryId: string;
  title: string;
  /** null while judging is blind (until results are out). */
  crew: string | null;
  /** 1-based place in the judge's presentation order; never changes under the judge. */
  position: number;
  cells: Record<string, GridCell>;
  note: string;
  noteVersion: number;
}

export interface GridData {
  criteria: ScaleCriterion[];
  rows: GridRow[];
  conflicted: number;
  withoutUpload: number;
  scored: number;
}
