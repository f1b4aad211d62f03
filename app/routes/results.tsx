import { Link } from "react-router";
import { AwardList } from "~/components/AwardList";
import { PrizeCaution, ShowcaseStandings } from "~/components/ShowcaseStandings";
import { StateBadge } from "~/components/StateBadge";
import { requestedVersion, requirePublicCompetition } from "~/results/page.server";
import { publicAwardsOfCompetition } from "~/results/awards.server";
import { publishedResults, publishedVersions } from "~/results/results.server";
import { hashSchemeLabel } from "~/results/canonical";
import { METHOD_NAMES } from "~/results/format";
import type { Route } from "./+types/results";
import { data } from "react-router";

export async function loader({ request, params }: Route.LoaderArgs) {
  const c = await requirePublicCompetition(params);
  const version = requestedVersion(request);
  const versions = await publishedVersions(c.id);
  const shown = versions.length ? await publishedResults(c.id, version) : null;
  if (version !== undefined && !shown) throw data({ message: `There is no version ${version} of these results.` }, { status: 404 });
  return {
    competition: { title: c.title, eventTitle: c.eventTitle, eventSlug: c.eventSlug, slug: c.slug, state: c.state },
    versions,
    shown: shown ? { version: shown.version, sha256: shown.sha256, hashScheme: shown.hashScheme, hashLabel: hashSchemeLabel(shown.hashScheme), note: shown.note, publishedAt: shown.publishedAt, payload: { method: shown.payload.method, counts: shown.payload.counts, standings: shown.payload.standings, rules: shown.payload.rules, criteria: shown.payload.criteria.map((k) => ({ name: k.name, weight: k.weight })) } } : null,
    newest: versions[0]?.version ?? null,
    awards: shown ? (await publicAwardsOfCompetition(c.eventId, c.id)).map((a) => ({ id: a.id, title: a.title, citation: a.citation, entry: a.winner!.title, crew: a.winner!.crew })) : [],
  };
}

export const meta: Route.MetaFunction = ({ data: d }) => {
  if (!d) return [{ title: "Results · Gatecrash" }];
  const winner = d.shown?.payload.standings[0];
  const description = winner ? `${winner.title} by ${winner.crew} wins ${d.competition.title} at ${d.competition.eventTitle}.` : `Results of ${d.competition.title}: not out yet.`;
  return [
    { title: `Results · ${d.competition.title} · Gatecrash` },
    { name: "description", content: description },
    { property: "og:title", content: `Results · ${d.competition.title}` },
    { property: "og:description", content: description },
  ];
};

export default function Results({ loaderData }: Route.ComponentProps) {
  const { competition: c, versions, shown, newest, awards } = loaderData;
  const base = `/e/${c.eventSlug}/${c.slug}`;
  return (
    <div>
      <p className="kicker">{c.eventTitle} · Results</p>
      <div className="mt-1 flex flex-wrap items-center gap-3">
        <h1 className="text-display font-extrabold">{c.title}</h1>
        <StateBadge state={c.state} />
      </div>
      {!shown ? (
        <div className="card mt-8" data-testid="results-not-out">
          <h2 className="text-xl font-extrabold">The results are not out yet</h2>
          <p className="mt-2 text-ink-soft">
            They appear here the moment the organizers publish them.{" "}
            <Link to={`${base}/showcase`} className="font-semibold text-signal">
              Watch the entries meanwhile
            </Link>
            .
          </p>
        </div>
      ) : (
        <>
          {shown.version !== newest && (
            <p role="alert" className="mt-4 rounded-md border border-warn bg-warn-soft p-3 text-sm font-semibold text-warn">
              You are looking at version {shown.version}. It was corrected later: <Link to={`${base}/results`} className="underline">see version {newest}</Link>.
            </p>
          )}
          <p className="mt-3 text-sm text-mute" data-testid="results-version">
            Version {shown.version}, published {new Date(shown.publishedAt).toUTCString()}. Jury {shown.payload.method.juryWeightPct} % ({METHOD_NAMES[shown.payload.method.jury]}), audience{" "}
            {shown.payload.method.audienceWeightPct} % ({METHOD_NAMES[shown.payload.method.audience]}). {shown.payload.counts.judges} judges, {shown.payload.counts.ballots} audience ballots.
          </p>
          {shown.note && (
            <p className="mt-3 rounded-md border border-violet bg-violet-soft p-3 text-sm" data-testid="results-note">
              <strong>Correction note:</strong> {shown.note}
            </p>
          )}
          <div className="card mt-6">
            <ShowcaseStandings rows={shown.payload.standings} juryPct={shown.payload.method.juryWeightPct} audiencePct={shown.payload.method.audienceWeightPct} caption="Final standings: each side scaled 0–1, then mixed by the weights. Places in brackets are per side." />
          </div>
          {awards.length > 0 && (
            <section className="card mt-6" aria-labelledby="awards-h" data-testid="results-awards">
              <h2 id="awards-h" className="font-extrabold">Awards</h2>
              <AwardList awards={awards} />
              <p className="mt-2 text-xs text-mute">
                Every compo and award of the party: <Link to={`/e/${c.eventSlug}`} className="font-semibold text-signal">the party page</Link>.
              </p>
            </section>
          )}
          <div className="mt-6 grid gap-6 lg:grid-cols-2">
            <section className="card">
              <h2 className="font-extrabold">Check it yourself</h2>
              <ul className="mt-2 space-y-1 text-sm">
                <li><a className="font-semibold text-signal" href={`${base}/results.csv?version=${shown.version}`}>Results as CSV</a></li>
                <li><a className="font-semibold text-signal" href={`${base}/results.txt?version=${shown.version}`}>Plain-text results sheet</a></li>
                <li><a className="font-semibold text-signal" href={`${base}/results.json?version=${shown.version}`}>The hashed results (JSON)</a></li>
                <li><a className="font-semibold text-signal" href={`${base}/recount.json?version=${shown.version}&side=jury`}>Anonymised jury scores (recount file)</a></li>
                <li><a className="font-semibold text-signal" href={`${base}/recount.json?version=${shown.version}&side=audience`}>Anonymised audience ballots (recount file)</a></li>
              </ul>
              <p className="mt-3 text-xs text-mute">
                Recount either file with <code className="font-mono">npm run recount -- FILE</code>; mix the two sides with the rules beside. {shown.hashLabel} of this version:{" "}
                <code className="break-all font-mono" data-testid="results-sha">{shown.sha256}</code>
                {shown.hashScheme === "rfc8785-sha256" && <> — check it with any RFC 8785 tool, e.g. <code className="font-mono">canonicalize &lt; results.json | sha256sum</code>.</>}
              </p>
            </section>
            <section className="card">
              <h2 className="font-extrabold">How it was counted</h2>
              <ul className="mt-2 list-disc space-y-1 pl-5 text-sm text-ink-soft">
                {[...shown.payload.rules.jury, ...shown.payload.rules.mix].map((r) => <li key={r}>{r}</li>)}
              </ul>
              {shown.payload.criteria.length > 0 && (
                <p className="mt-2 text-xs text-mute">Criteria: {shown.payload.criteria.map((k) => `${k.name} ×${k.weight}`).join(", ")}.</p>
              )}
            </section>
          </div>
          {versions.length > 1 && (
            <section className="mt-6">
              <h2 className="font-extrabold">All versions</h2>
              <ol className="mt-2 space-y-1 text-sm" data-testid="results-versions">
                {versions.map((v) => (
                  <li key={v.version}>
                    <Link to={`${base}/results?version=${v.version}`} className="font-semibold text-signal">Version {v.version}</Link> · {new Date(v.publishedAt).toUTCString()}
                    {v.note && <span className="text-ink-soft"> · {v.note}</span>}
                  </li>
                ))}
              </ol>
            </section>
          )}
        </>
      )}
      <div className="mt-8">
        <PrizeCaution />
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
