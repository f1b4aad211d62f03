import { eq, inArray } from "drizzle-orm";
import { Link } from "react-router";
import { crewIdsOf, requireUser } from "~/auth/guards.server";
import { db } from "~/db/client.server";
import { competitions, crews, entries, events } from "~/db/schema";
import { StateBadge } from "~/components/StateBadge";
import type { Route } from "./+types/my.entries";

export const meta: Route.MetaFunction = () => [{ title: "My entries · Gatecrash" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const crewIds = await crewIdsOf(user.id);
  const rows =
    crewIds.length === 0
      ? []
      : await db()
          .select({
            id: entries.id,
            title: entries.title,
            feeState: entries.feeState,
            state: entries.state,
            crew: crews.name,
            competition: competitions.title,
            competitionState: competitions.state,
            event: events.title,
          })
          .from(entries)
          .innerJoin(crews, eq(crews.id, entries.crewId))
          .innerJoin(competitions, eq(competitions.id, entries.competitionId))
          .innerJoin(events, eq(events.id, competitions.eventId))
          .where(inArray(entries.crewId, crewIds));
  return { entries: rows, hasCrew: crewIds.length > 0 };
}

export default function MyEntries({ loaderData }: Route.ComponentProps) {
  return (
    <div data-testid="my-entries">
      <p className="kicker">Entrant</p>
      <h1 className="mb-6 mt-1 text-display font-extrabold">My entries</h1>
      {loaderData.entries.length === 0 ? (
        <p className="text-mute">{loaderData.hasCrew ? "Your crew has no entries yet." : "You are not in a crew yet."}</p>
      ) : (
        <ul className="grid gap-3 sm:grid-cols-2">
          {loaderData.entries.map((e) => (
            <li key={e.id}>
              <Link to={`/entries/${e.id}`} className="card block hover:border-ink-soft">
                <div className="flex items-center justify-between text-xs text-mute">
                  <span>
                    {e.event} · {e.competition}
                  </span>
                  <StateBadge state={e.competitionState} />
                </div>
                <div className="mt-1 text-lg font-bold">{e.title}</div>
                <div className="text-sm text-ink-soft">by {e.crew}</div>
              </Link>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
