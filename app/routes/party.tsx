import { data, Link } from "react-router";
import { formatInZone } from "~/competitions/timezone";
import { PrizeCaution } from "~/components/ShowcaseStandings";
import { AwardList } from "~/components/AwardList";
import { StateBadge } from "~/components/StateBadge";
import { publicParty } from "~/party/public.server";
import { SLOT_NAMES } from "~/party/timetable";
import type { Route } from "./+types/party";

/** The public party page: its compos, the timetable (deadlines, vote windows, shows), awards and the party-wide sheets. */
export async function loader({ params }: Route.LoaderArgs) {
  const p = await publicParty(params.eventSlug);
  if (!p) throw data({ message: "There is no such party, or nothing of it is public yet." }, { status: 404 });
  const tz = p.event.timeZone;
  return {
    event: { slug: p.event.slug, title: p.event.title, description: p.event.description, venue: p.event.venue, timeZone: tz, startsAt: p.event.startsAt ? formatInZone(p.event.startsAt, tz) : null, endsAt: p.event.endsAt ? formatInZone(p.event.endsAt, tz) : null },
    compos: p.compos.map((c) => ({ slug: c.slug, title: c.title, description: c.description, state: c.state })),
    slots: p.slots.map((s) => ({ kind: s.kind, name: SLOT_NAMES[s.kind], compo: s.competitionTitle, compoSlug: s.competitionSlug, start: formatInZone(s.start, tz), end: s.end ? formatInZone(s.end, tz) : null, startIso: s.start.toISOString() })),
    awards: p.awards.map((a) => ({ id: a.id, title: a.title, citation: a.citation, entry: a.winner!.title, crew: a.winner!.crew, compo: a.winner!.competitionTitle, compoSlug: a.winner!.competitionSlug })),
    anyResults: p.compos.some((c) => c.state === "results"),
  };
}

export const meta: Route.MetaFunction = ({ data: d }) =>
  d ? [{ title: `${d.event.title} · Gatecrash` }, { name: "description", content: `${d.event.title}: ${d.compos.length} compos, the timetable and the results.` }] : [{ title: "Party · Gatecrash" }];

export default function Party({ loaderData }: Route.ComponentProps) {
  const { event: e, compos, slots, awards, anyResults } = loaderData;
  const base = `/e/${e.slug}`;
  return (
    <div>
      <p className="kicker">Party</p>
      <h1 className="mt-1 text-display font-extrabold">{e.title}</h1>
      <p className="mt-2 text-sm text-ink-soft">
        {[e.venue, e.startsAt && e.endsAt ? `${e.startsAt} → ${e.endsAt}` : null, e.timeZone].filter(Boolean).join(" · ")}
      </p>
      {e.description && <p className="mt-3 max-w-3xl whitespace-pre-line text-ink-soft">{e.description}</p>}
      <div className="mt-5 flex flex-wrap gap-3">
        <a href={`${base}/calendar.ics`} className="btn-quiet" download>
          The whole timetable in your calendar (.ics)
        </a>
        {anyResults && (
          <>
            <a href={`${base}/results.txt`} className="btn-quiet">Party results (text)</a>
            <a href={`${base}/results.csv`} className="btn-quiet">Party results (CSV)</a>
          </>
        )}
      </div>

      <section className="mt-8" aria-labelledby="compos-h">
        <h2 id="compos-h" className="text-xl font-bold">Compos</h2>
        <ul className="mt-3 grid gap-3 sm:grid-cols-2">
          {compos.map((c) => (
            <li key={c.slug}>
              <Link to={`${base}/${c.slug}`} className="card block hover:border-ink-soft">
                <div className="flex items-center justify-between gap-2">
                  <span className="text-lg font-bold">{c.title}</span>
                  <StateBadge state={c.state} />
                </div>
                {c.description && <p className="mt-1 line-clamp-2 text-sm text-ink-soft">{c.description}</p>}
              </Link>
            </li>
          ))}
        </ul>
      </section>

      <section className="card mt-8" aria-labelledby="timetable-h">
        <h2 id="timetable-h" className="text-xl font-bold">Timetable</h2>
        <p className="mt-1 text-sm text-mute">All times in the party's time zone, {e.timeZone}.</p>
        {slots.length === 0 ? (
          <p className="mt-3 text-mute">Nothing scheduled yet.</p>
        ) : (
          <table className="mt-3 w-full text-sm" data-testid="timetable">
            <thead>
              <tr className="text-left text-xs uppercase tracking-wider text-mute">
                <th scope="col" className="py-1">When</th>
                <th scope="col">What</th>
                <th scope="col">Compo</th>
              </tr>
            </thead>
            <tbody>
              {slots.map((s) => (
                <tr key={`${s.kind}-${s.compoSlug}`} className="border-t border-line" data-kind={s.kind}>
                  <td className="py-1.5 pr-3 tabular-nums">
                    <time dateTime={s.startIso}>{s.start}</time>
                    {s.end && <span className="text-ink-soft"> → {s.end}</span>}
                  </td>
                  <td className="pr-3 font-semibold">{s.name}</td>
                  <td>
                    <Link to={`${base}/${s.compoSlug}${s.kind === "vote" ? "/vote" : ""}`} className="text-signal">
                      {s.compo}
                    </Link>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>

      {awards.length > 0 && (
        <section className="card mt-8" aria-labelledby="awards-h" data-testid="party-awards">
          <h2 id="awards-h" className="text-xl font-bold">Awards</h2>
          <AwardList
            awards={awards}
            extra={(a) => (
              <>
                {" "}
                <Link to={`${base}/${a.compoSlug}/results`} className="text-sm text-signal">
                  ({a.compo})
                </Link>
              </>
            )}
          />
        </section>
      )}
      <div className="mt-8">
        <PrizeCaution />
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
