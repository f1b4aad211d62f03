/**
 * Keyboard movement on the scoring grid, as a pure function so it can be tested without a browser.
 * Positions are (row, col) over the rendered rows and the navigable columns.
 */
export interface Pos {
  row: number;
  col: number;
}

export type GridMove = "up" | "down" | "left" | "right" | "next" | "prev" | "home" | "end";

/**
 * `next`/`prev` (Tab/Shift+Tab after a commit) run through the score columns `firstScoreCol..lastScoreCol`
 * and wrap to the next/previous row, so a judge can type a whole competition as digits and Tab.
 * Returns null when the move would leave the grid (Tab past the last cell lets focus leave).
 */
export function moveCell(pos: Pos, move: GridMove, rows: number, cols: number, firstScoreCol: number, lastScoreCol: number): Pos | null {
  if (rows === 0 || cols === 0) return null;
  const clampRow = (r: number) => Math.max(0, Math.min(rows - 1, r));
  const clampCol = (c: number) => Math.max(0, Math.min(cols - 1, c));
  switch (move) {
    case "up":
      return { row: clampRow(pos.row - 1), col: pos.col };
    case "down":
      return { row: clampRow(pos.row + 1), col: pos.col };
    case "left":
      return { row: pos.row, col: clampCol(pos.col - 1) };
    case "right":
      return { row: pos.row, col: clampCol(pos.col + 1) };
    case "home":
      return { row: pos.row, col: 0 };
    case "end":
      return { row: pos.row, col: cols - 1 };
    case "next":
      if (pos.col < firstScoreCol) return { row: pos.row, col: firstScoreCol };
      if (pos.col < lastScoreCol) return { row: pos.row, col: pos.col + 1 };
      return pos.row + 1 < rows ? { row: pos.row + 1, col: firstScoreCol } : null;
    case "prev":
      if (pos.col > lastScoreCol) return { row: pos.row, col: lastScoreCol };
      if (pos.col > firstScoreCol) return { row: pos.row, col: pos.col - 1 };
      return pos.row > 0 ? { row: pos.row - 1, col: lastScoreCol } : null;
  }
}
