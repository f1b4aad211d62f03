import { useEffect, useRef, useState } from "react";

/** The ballot controls of the vote page. Keyboard-first: radios for points, move up/down buttons for rankings. */
export interface BallotEntry {
  id: string;
  title: string;
  crew: string | null;
  position: number;
}

export function PointsInputs({ entries, initial, disabled }: { entries: BallotEntry[]; initial: Record<string, number>; disabled: boolean }) {
  return (
    <ol className="space-y-3" data-testid="points-ballot">
      {entries.map((e) => (
        <li key={e.id}>
          <fieldset className="card flex flex-wrap items-center justify-between gap-3 p-4" disabled={disabled}>
            <legend className="sr-only">Points for {e.title}</legend>
            <div aria-hidden="true">
              <span className="font-mono text-xs text-mute">#{e.position}</span> <span className="font-extrabold">{e.title}</span>
              {e.crew && <span className="text-sm text-mute"> · {e.crew}</span>}
            </div>
            <div className="flex flex-wrap gap-1" role="presentation">
              {["", "0", "1", "2", "3", "4", "5"].map((v) => {
                const id = `points-${e.id}-${v || "none"}`;
                return (
                  <span key={v}>
                    <input
                      type="radio"
                      id={id}
                      name={`points.${e.id}`}
                      value={v}
                      defaultChecked={v === "" ? initial[e.id] === undefined : initial[e.id] === Number(v)}
                      className="peer sr-only"
                    />
                    <label
                      htmlFor={id}
                      className="inline-flex h-9 min-w-9 cursor-pointer items-center justify-center rounded-md border border-line bg-card px-2 text-sm font-semibold peer-checked:border-ink peer-checked:bg-ink peer-checked:text-paper peer-focus-visible:outline-3 peer-focus-visible:outline-violet"
                    >
                      <span className="sr-only">{e.title}: </span>
                      {v === "" ? "—" : v}
                      <span className="sr-only">{v === "" ? " not rated" : v === "1" ? " point" : " points"}</span>
                    </label>
                  </span>
                );
              })}
            </div>
          </fieldset>
        </li>
      ))}
    </ol>
  );
}

export function RankedInputs({ entries, initial, disabled }: { entries: BallotEntry[]; initial: string[]; disabled: boolean }) {
  const byId = new Map(entries.map((e) => [e.id, e]));
  const start = [...initial.filter((id) => byId.has(id)), ...entries.map((e) => e.id).filter((id) => !initial.includes(id))];
  const [order, setOrder] = useState(start);
  const [focus, setFocus] = useState<{ id: string; dir: "up" | "down" } | null>(null);
  const [announce, setAnnounce] = useState("");
  const buttons = useRef(new Map<string, HTMLButtonElement>());

  useEffect(() => {
    if (!focus) return;
    const wanted = buttons.current.get(`${focus.id}:${focus.dir}`);
    const other = buttons.current.get(`${focus.id}:${focus.dir === "up" ? "down" : "up"}`);
    (wanted && !wanted.disabled ? wanted : other)?.focus();
  }, [focus, order]);

  function move(i: number, delta: -1 | 1) {
    const j = i + delta;
    if (j < 0 || j >= order.length) return;
    const next = [...order];
    [next[i], next[j]] = [next[j], next[i]];
    setOrder(next);
    setFocus({ id: order[i], dir: delta < 0 ? "up" : "down" });
    setAnnounce(`${byId.get(order[i])?.title} is now place ${j + 1} of ${order.length}.`);
  }

  return (
    <div>
      <p className="mb-3 text-sm text-ink-soft">Your favourite on top. Use the buttons (or Tab and Enter) to move an entry up or down.</p>
      <ol className="space-y-2" data-testid="ranked-ballot">
        {order.map((id, i) => {
          const e = byId.get(id)!;
          return (
            <li key={id} className="card flex items-center gap-3 p-3" data-testid="ranked-item">
              <input type="hidden" name={`ranking[${i}]`} value={id} />
              <span className="w-8 text-center text-2xl font-extrabold tabular-nums text-signal">{i + 1}</span>
              <div className="flex-1">
                <span className="font-extrabold">{e.title}</span>
                {e.crew && <span className="text-sm text-mute"> · {e.crew}</span>}
                <span className="ml-2 font-mono text-xs text-mute">#{e.position}</span>
              </div>
              <button
                type="button"
                className="btn-quiet px-3"
                disabled={disabled || i === 0}
                aria-label={`Move ${e.title} up`}
                ref={(el) => {
                  if (el) buttons.current.set(`${id}:up`, el);
                }}
                onClick={() => move(i, -1)}
              >
                ↑
              </button>
              <button
                type="button"
                className="btn-quiet px-3"
                disabled={disabled || i === order.length - 1}
                aria-label={`Move ${e.title} down`}
                ref={(el) => {
                  if (el) buttons.current.set(`${id}:down`, el);
                }}
                onClick={() => move(i, 1)}
              >
                ↓
              </button>
            </li>
          );
        })}
      </ol>
      <p aria-live="polite" className="sr-only">
        {announce}
      </p>
    </div>
  );
}
