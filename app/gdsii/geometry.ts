/** Small geometry helpers over plain number boxes [x0, y0, x1, y1]; an empty box has x0 > x1. */
export type Box = [number, number, number, number];

export function emptyBox(): Box {
  return [Infinity, Infinity, -Infinity, -Infinity];
}

export function isEmpty(b: Box): boolean {
  return b[0] > b[2];
}

export function addPoint(b: Box, x: number, y: number): void {
  if (x < b[0]) b[0] = x;
  if (y < b[1]) b[1] = y;
  if (x > b[2]) b[2] = x;
  if (y > b[3]) b[3] = y;
}

export function addBox(b: Box, o: Box): void {
  if (o[0] < b[0]) b[0] = o[0];
  if (o[1] < b[1]) b[1] = o[1];
  if (o[2] > b[2]) b[2] = o[2];
  if (o[3] > b[3]) b[3] = o[3];
}

/** cos and sin of an angle in degrees, exact for multiples of 90 so Manhattan layouts stay exact. */
export function cosSin(angleDeg: number): [number, number] {
  const a = ((angleDeg % 360) + 360) % 360;
  if (a === 0) return [1, 0];
  if (a === 90) return [0, 1];
  if (a === 180) return [-1, 0];
  if (a === 270) return [0, -1];
  const r = (a * Math.PI) / 180;
  return [Math.cos(r), Math.sin(r)];
}

/**
 * GDSII placement order: reflect about the x axis first, then magnify, then rotate counter-clockwise.
 * Returns the axis-aligned box of the four transformed corners (translation excluded).
 */
export function transformBox(b: Box, reflect: boolean, mag: number, angleDeg: number): Box {
  const [c, s] = cosSin(angleDeg);
  const out = emptyBox();
  const xs = [b[0], b[2]];
  const ys = [b[1], b[3]];
  for (const x of xs) {
    for (const y0 of ys) {
      const y = reflect ? -y0 : y0;
      addPoint(out, mag * (c * x - s * y), mag * (s * x + c * y));
    }
  }
  return out;
}

