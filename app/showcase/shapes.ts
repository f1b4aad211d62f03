/** Showcase shapes shared by the server modules and the components. */

/** An entry's public figures; null where the check has not measured them (yet). */
export interface PublicStats {
  flipFlops: number | null;
  cells: number | null;
  sourceLines: number | null;
  tileShape: string | null;
  tileSizeUm: { width: number; height: number } | null;
  /** Placed-cell area over die area, 0..1. */
  utilization: number | null;
}
