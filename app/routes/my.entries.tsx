import { Link } from "react-router";
import { requireUser } from "~/auth/guards.server";
import { publicCompetitions } from "~/competitions/listing.server";
import { formatInZone } from "~/competitions/timezone";
import { StateBadge } from "~/components/StateBadge";
import { crewsOf } from "~/crews/service.server";
import { entriesOfMember } from "~/entries/service.server";
import type { Route } from "./+types/my.entries";

export const meta: Route.MetaFunction = () => [{ title: "My entries · Gatecrash" }];

const FEE: Record<string, string> = { not_required: "no fee", unpaid: "fee unpaid", pending: "payment open", paid: "fee paid", refunded: "fee refunded" };

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireUser(request, context);
  const rows = await entriesOfMember(user.id);
  const myCrews = await crewsOf(user.id);
  const open = (await publicCompetitions()).filter((c) => c.state === "open");
  return {
    entries: rows,
    hasCrew: myCrews.length > 0,
    crews: myCrews,
    // An open compo is worth offering while at least one of my crews has not entered it.
    // The deadline text is made here: browsers refuse formatInZone's option mix (dateStyle with timeZoneName).
    openCompetitions: open.map((c) => ({ ...c, deadlineText: c.deadlineAt ? formatInZone(c.deadlineAt, c.timeZone) : null, enteredByAll: myCrews.length > 0 && myCrews.every((cr) => rows.some((r) => r.crewId === cr.id && r.competitionId === c.id)) })),
  };
}

export default function MyEntries({ loaderData }: Route.ComponentProps) {
  const { crews: myCrews, openCompetitions } = loaderData;
  return (
    <div data-testid="my-entries">
      <p className="kicker">Entrant</p>
      <h1 className="mb-6 mt-1 text-display font-extrabold">My entries</h1>
      <div className="grid gap-8 lg:grid-cols-[2fr_1fr]">
        <section>
          {loaderData.entries.length === 0 ? (
            <p className="text-mute">{loaderData.hasCrew ? "Your crew has no entries yet. Enter an open compo." : "You are not in a crew yet. Start one to enter a compo."}</p>
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
                    <div className="text-sm text-ink-soft">
                      by {e.crew} · {FEE[e.feeState] ?? e.feeState}
                    </div>
                  </Link>
                </li>
              ))}
            </ul>
          )}
          <h2 className="mb-3 mt-8 text-lg font-bold">Open compos</h2>
          {openCompetitions.length === 0 ? (
            <p className="text-mute">No compo takes entries right now.</p>
          ) : (
            <ul className="grid gap-2">
              {openCompetitions.map((c) => (
                <li key={c.id} className="card flex flex-wrap items-center justify-between gap-2 py-3">
                  <span>
                    <span className="font-semibold">{c.title}</span> <span className="text-sm text-mute">{c.eventTitle}</span>
                    {c.deadlineText && <span className="block text-xs text-ink-soft">Deadline {c.deadlineText}</span>}
                  </span>
                  {c.enteredByAll ? (
                    <span className="text-sm text-mute">Entered</span>
                  ) : (
                    <Link to={`/e/${c.eventSlug}/${c.slug}/enter`} className="btn-primary">
                      Enter {c.title}
                    </Link>
                  )}
                </li>
              ))}
            </ul>
          )}
        </section>
        <aside>
          <h2 className="mb-3 text-lg font-bold">My crews</h2>
          <ul className="mb-4 grid gap-2">
            {myCrews.map((c) => (
              <li key={c.id}>
                <Link to={`/crews/${c.id}`} className="card block py-3 hover:border-ink-soft">
                  <span className="font-semibold">{c.name}</span> <span className="text-sm text-mute">@{c.handle} · {c.role}</span>
                </Link>
              </li>
            ))}
          </ul>
          <Link to="/crews/new" className="btn-quiet">
            Start a crew
          </Link>
        </aside>
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
