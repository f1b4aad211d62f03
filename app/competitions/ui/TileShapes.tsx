import type { TileShape } from "~/rules/ruleset";
import { drawingScale, fmtArea, shapeBoxes } from "../tile-shapes";

/** The allowed tile shapes, drawn to one scale: tile grid dashed, outline solid, size and area under each. */
export function TileShapes({ tile }: { tile: { widthUm: number; heightUm: number; maxTiles: number; allowedShapes: TileShape[] } }) {
  const boxes = shapeBoxes(tile);
  const { pxPerUm, barUm } = drawingScale(boxes);
  const gap = 40;
  const top = 16;
  const tallest = Math.max(...boxes.map((b) => b.heightUm)) * pxPerUm;
  const height = top + tallest + 70;
  let x = gap;
  const placed = boxes.map((b) => {
    const w = b.widthUm * pxPerUm;
    const hgt = b.heightUm * pxPerUm;
    const at = { ...b, x, y: top + tallest - hgt, w, h: hgt };
    x += w + gap;
    return at;
  });
  const width = Math.max(x, 260);
  const label = `Allowed tile shapes, to scale: ${boxes.map((b) => `${b.shape} is ${b.widthUm} by ${b.heightUm} µm, ${fmtArea(b.areaMm2)} mm²`).join("; ")}.`;
  return (
    <figure>
      <svg viewBox={`0 0 ${width} ${height}`} width="100%" style={{ maxWidth: width }} role="img" aria-label={label} data-testid="tile-shapes">
        <title>{label}</title>
        {placed.map((b) => (
          <g key={b.shape}>
            <rect x={b.x} y={b.y} width={b.w} height={b.h} fill={b.withinLimit ? "var(--color-signal-soft)" : "var(--color-line)"} stroke="var(--color-ink)" strokeWidth={1.5} />
            {Array.from({ length: b.cols - 1 }, (_, i) => (
              <line key={`c${i}`} x1={b.x + ((i + 1) * b.w) / b.cols} x2={b.x + ((i + 1) * b.w) / b.cols} y1={b.y} y2={b.y + b.h} stroke="var(--color-ink-soft)" strokeDasharray="4 3" />
            ))}
            {Array.from({ length: b.rows - 1 }, (_, i) => (
              <line key={`r${i}`} x1={b.x} x2={b.x + b.w} y1={b.y + ((i + 1) * b.h) / b.rows} y2={b.y + ((i + 1) * b.h) / b.rows} stroke="var(--color-ink-soft)" strokeDasharray="4 3" />
            ))}
            <text x={b.x + b.w / 2} y={b.y + b.h / 2 + 5} textAnchor="middle" fontSize={14} fontWeight={700} fill="var(--color-ink)">
              {b.shape}
            </text>
            <text x={b.x + b.w / 2} y={top + tallest + 18} textAnchor="middle" fontSize={12} fill="var(--color-ink)">
              {b.widthUm} × {b.heightUm} µm
            </text>
            <text x={b.x + b.w / 2} y={top + tallest + 34} textAnchor="middle" fontSize={12} fill="var(--color-ink-soft)">
              {fmtArea(b.areaMm2)} mm²{b.withinLimit ? "" : " (over the tile limit)"}
            </text>
          </g>
        ))}
        <g transform={`translate(${gap}, ${top + tallest + 52})`}>
          <line x1={0} x2={barUm * pxPerUm} y1={0} y2={0} stroke="var(--color-ink)" strokeWidth={2} />
          <line x1={0} x2={0} y1={-4} y2={4} stroke="var(--color-ink)" strokeWidth={2} />
          <line x1={barUm * pxPerUm} x2={barUm * pxPerUm} y1={-4} y2={4} stroke="var(--color-ink)" strokeWidth={2} />
          <text x={barUm * pxPerUm + 8} y={4} fontSize={12} fill="var(--color-ink)">
            {barUm} µm
          </text>
        </g>
      </svg>
      <figcaption className="mt-1 text-xs text-mute">
        Drawn to one scale. One tile is {tile.widthUm} × {tile.heightUm} µm; an entry may use at most {tile.maxTiles} tile{tile.maxTiles === 1 ? "" : "s"}.
      </figcaption>
    </figure>
  );
}
