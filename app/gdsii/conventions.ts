/**
 * Gatecrash's own layer conventions for entries (our choice, not any process's layer map).
 * The die outline: a rectangle on this layer in the top cell marks the entry's die.
 */
export const DIE_OUTLINE_LAYER = { layer: 200, datatype: 0 } as const;

/** Cell names containing this (case-insensitive) are filler, drawn as such in layout pictures. */
export const FILL_CELL_PATTERN = "fill|decap|tap";
