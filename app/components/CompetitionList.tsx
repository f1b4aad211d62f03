import type { CompetitionCard } from "~/competitions/shapes";
import { Link } from "react-router";
import { formatInZone } from "~/competitions/zone-format";
import { StateBadge } from "./StateBadge";

export function CompetitionList({ items, linkTo }: { items: CompetitionCard[]; linkTo: (c: CompetitionCard) => string }) {
  if (items.length === 0) return <p className="text-mute">Nothing here yet.</p>;
  return (
    <ul className="grid gap-3 sm:grid-cols-2">
      {items.map((c) => (
        <li key={c.id}>
          <Link to={linkTo(c)} className="card block hover:border-ink-soft">
            <div className="flex items-center justify-between gap-2">
              <span className="text-xs font-medium text-mute">{c.eventTitle}</span>
              <StateBadge state={c.state} />
            </div>
            <div className="mt-1 text-lg font-bold">{c.title}</div>
            {c.deadlineAt && <div className="mt-1 text-sm text-ink-soft">Deadline {formatInZone(c.deadlineAt, c.timeZone)}</div>}
          </Link>
        </li>
      ))}
    </ul>
  );
}
