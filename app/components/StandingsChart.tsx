/**
 * Each judge's score distribution as a strip of dots on the criteria's scale, with the judge's mean (a bar)
 * and ±1 SD (a band), so a lenient, harsh or flat judge stands out at a glance.
 *
 * Colours: the Okabe–Ito palette (Okabe & Ito, "Color Universal Design", 2008), designed to stay
 * distinguishable under the common colour-vision deficiencies; each judge also has their own marker shape and
 * their name at the start of their strip, so colour is never the only cue.
 */
export const OKABE_ITO = ["#E69F00", "#56B4E9", "#009E73", "#F0E442", "#0072B2", "#D55E00", "#CC79A7", "#000000"] as const;
const SHAPES = ["circle", "square", "triangle", "diamond", "cross", "triangle-down", "plus", "star"] as const;

export interface ChartJudge {
  id: string;
  name: string;
  values: number[];
  mean: number | null;
  sd: number | null;
}

function Marker({ shape, x, y, color }: { shape: (typeof SHAPES)[number]; x: number; y: number; color: string }) {
  const s = 5;
  const stroke = { stroke: "#16131f", strokeWidth: 0.8, fill: color, fillOpacity: 0.85 };
  switch (shape) {
    case "circle":
      return <circle cx={x} cy={y} r={s} {...stroke} />;
    case "square":
      return <rect x={x - s} y={y - s} width={2 * s} height={2 * s} {...stroke} />;
    case "triangle":
      return <polygon points={`${x},${y - s - 1} ${x + s + 1},${y + s} ${x - s - 1},${y + s}`} {...stroke} />;
    case "triangle-down":
      return <polygon points={`${x},${y + s + 1} ${x + s + 1},${y - s} ${x - s - 1},${y - s}`} {...stroke} />;
    case "diamond":
      return <polygon points={`${x},${y - s - 1} ${x + s + 1},${y} ${x},${y + s + 1} ${x - s - 1},${y}`} {...stroke} />;
    case "cross":
      return <path d={`M${x - s},${y - s}L${x + s},${y + s}M${x + s},${y - s}L${x - s},${y + s}`} stroke={color} strokeWidth={3} />;
    case "plus":
      return <path d={`M${x - s},${y}L${x + s},${y}M${x},${y - s}L${x},${y + s}`} stroke={color} strokeWidth={3} />;
    default:
      return <circle cx={x} cy={y} r={s + 1} {...stroke} />;
  }
}

export function StandingsChart({ judges, min, max }: { judges: ChartJudge[]; min: number; max: number }) {
  const left = 150;
  const width = 720;
  const rowH = 46;
  const top = 16;
  const height = top + judges.length * rowH + 34;
  const span = Math.max(1e-9, max - min);
  const xOf = (v: number) => left + ((v - min) / span) * (width - left - 20);
  const ticks = Array.from({ length: Math.floor(span) + 1 }, (_, i) => min + i).filter((t) => span <= 20 || t % 5 === 0);
  return (
    <figure>
      <svg viewBox={`0 0 ${width} ${height}`} role="img" aria-labelledby="dist-title dist-desc" className="w-full max-w-3xl" data-testid="distribution-chart">
        <title id="dist-title">Score distribution per judge</title>
        <desc id="dist-desc">
          {judges.map((j) => `${j.name}: ${j.values.length} scores, mean ${j.mean?.toFixed(2) ?? "none"}, SD ${j.sd?.toFixed(2) ?? "none"}`).join("; ")}
        </desc>
        {ticks.map((t) => (
          <g key={t}>
            <line x1={xOf(t)} x2={xOf(t)} y1={top - 6} y2={height - 28} stroke="#e4ded3" />
            <text x={xOf(t)} y={height - 12} textAnchor="middle" fontSize={11} fill="#6b6580">
              {t}
            </text>
          </g>
        ))}
        {judges.map((j, i) => {
          const y = top + i * rowH + rowH / 2;
          const color = OKABE_ITO[i % OKABE_ITO.length];
          const shape = SHAPES[i % SHAPES.length];
          // Equal values are stacked a little apart vertically so each score stays visible.
          const seen = new Map<number, number>();
          return (
            <g key={j.id}>
              <Marker shape={shape} x={16} y={y} color={color} />
              <text x={28} y={y + 4} fontSize={12} fill="#16131f" fontWeight={600}>
                {j.name.length > 16 ? `${j.name.slice(0, 15)}…` : j.name}
              </text>
              {j.mean !== null && j.sd !== null && (
                <>
                  <rect x={xOf(Math.max(min, j.mean - j.sd))} y={y - 14} width={Math.max(1, xOf(Math.min(max, j.mean + j.sd)) - xOf(Math.max(min, j.mean - j.sd)))} height={28} fill={color} opacity={0.18} />
                  <line x1={xOf(j.mean)} x2={xOf(j.mean)} y1={y - 16} y2={y + 16} stroke="#16131f" strokeWidth={2} />
                </>
              )}
              {j.values.map((v, k) => {
                const n = seen.get(v) ?? 0;
                seen.set(v, n + 1);
                const dy = ((n % 5) - 2) * 4;
                return <Marker key={k} shape={shape} x={xOf(v)} y={y + dy} color={color} />;
              })}
            </g>
          );
        })}
      </svg>
      <figcaption className="mt-2 text-xs text-mute">
        One strip per judge: every score they gave (marker), their mean (black bar) and ±1 SD (shaded band). Colours from the Okabe–Ito palette, with a
        different marker shape per judge.
      </figcaption>
    </figure>
  );
}
