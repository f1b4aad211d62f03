/** What Gatecrash keeps of a GDSII library: per-structure summaries, never the whole object graph. */
export type BoxUm = [x0: number, y0: number, x1: number, y1: number];

export interface LayoutLabel {
  text: string;
  layer: number;
  texttype: number;
  xUm: number;
  yUm: number;
}

export interface LayerKey {
  layer: number;
  datatype: number;
}

export interface CellSummary {
  /** Bounding box with every placement under it applied; null for a cell with nothing in it. */
  bboxUm: BoxUm | null;
  /** True when the cell places no other cell. */
  leaf: boolean;
}

/** Placements made directly in the top cell (for pictures); an AREF is one entry with its member count. */
export interface TopPlacements {
  cellNames: string[];
  /** Index into cellNames, one per placement. */
  cell: Uint32Array;
  /** x0, y0, x1, y1 in µm per placement: the placed cell's box (for an AREF, of the whole array). */
  boxUm: Float64Array;
  count: Float64Array;
  length: number;
  /** More placements existed than the collection limit allowed. */
  truncated: boolean;
}

export interface LayoutSummary {
  libName: string;
  units: { userUnitsPerDbUnit: number; metersPerDbUnit: number };
  /** Cells that no other cell places. */
  topCells: string[];
  /** The single top cell, or the one with the largest bounding box when there are several. */
  topCell: string;
  bboxUm: BoxUm | null;
  /** Flattened count of every cell under the top cell (AREFs expanded, nesting multiplied). */
  instances: Record<string, number>;
  /** False when some count exceeds 2^53 and `instances` holds a rounded value. */
  instanceCountsExact: boolean;
  /** Texts placed in the top cell itself, in the top cell's µm. */
  labels: LayoutLabel[];
  labelsTruncated: boolean;
  /**
   * Placements whose STRANS sets absolute magnification (0x0004) or absolute angle (0x0002). Gatecrash composes every
   * transform with the ones above it, as for relative ones, so figures under such a placement may be wrong; the
   * layout check refuses them. `cells`: the cells that hold such placements, by name.
   */
  absoluteTransforms: { placements: number; magnification: boolean; angle: boolean; cells: string[] };
  /** Every layer/datatype pair used by a boundary, path, box or text anywhere in the library. */
  layers: LayerKey[];
  /** Bounding box of the top cell's own shapes, per layer (its placements not included). */
  topCellLayers: (LayerKey & { bboxUm: BoxUm })[];
  cells: Record<string, CellSummary>;
  structureCount: number;
  recordCount: number;
  depth: number;
  placements?: TopPlacements;
}

export interface ReadLimits {
  maxStructures: number;
  maxRecords: number;
  /** Longest chain of placements from a top cell down to a leaf. */
  maxDepth: number;
  /** Distinct (child, orientation, magnification) combinations over the whole library. */
  maxPlacementClasses: number;
  maxLabels: number;
  /** Only for readLayoutFile: refuse larger files before reading them. */
  maxBytes: number;
}

export const DEFAULT_READ_LIMITS: ReadLimits = {
  maxStructures: 200_000,
  maxRecords: 40_000_000,
  maxDepth: 100_000,
  maxPlacementClasses: 2_000_000,
  maxLabels: 20_000,
  maxBytes: 256 * 1024 * 1024,
};

export interface ReadOptions {
  limits?: Partial<ReadLimits>;
  /** Collect up to this many placements of the top cell for drawing (0 = none). */
  collectPlacements?: number;
}
