import type { ReactNode } from "react";

export interface AwardLine {
  id: string;
  title: string;
  citation: string;
  entry: string;
  crew: string;
}

/** A party's awards as a list: award, winning entry and crew, the citation under it; `extra` adds to each line. */
export function AwardList<T extends AwardLine>({ awards, extra }: { awards: T[]; extra?: (a: T) => ReactNode }) {
  return (
    <ul className="mt-3 space-y-2">
      {awards.map((a) => (
        <li key={a.id}>
          <span className="font-bold">{a.title}</span>: {a.entry} by {a.crew}
          {extra?.(a)}
          {a.citation && <p className="text-sm text-ink-soft">{a.citation}</p>}
        </li>
      ))}
    </ul>
  );
}
