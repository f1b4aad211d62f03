import { Link } from "react-router";
import { StateBadge } from "~/components/StateBadge";
import { VerdictPill } from "~/components/ShowcaseStats";
import { absoluteUrl, publicCompetitionView, requireShowcase } from "~/showcase/page.server";
import { publishedShowcase } from "~/showcase/published.server";
import { markPublicPage } from "~/security/public-page.server";
import type { Route } from "./+types/showcase";

export async function loader({ params, context }: Route.LoaderArgs) {
  const c = await requireShowcase(params);
  const { version, entries: list } = await publishedShowcase(c);
  markPublicPage(context, version);
  const cover = list.map((e) => e.media.still ?? e.media.firstFrame).find(Boolean) ?? null;
  return { competition: publicCompetitionView(c), entries: list, ogImage: absoluteUrl(cover) };
}

export const meta: Route.MetaFunction = ({ data }) => {
  if (!data) return [{ title: "Showcase · Gatecrash" }];
  const title = `${data.competition.title} — showcase · Gatecrash`;
  const description = `${data.entries.length} entries of ${data.competition.title} at ${data.competition.eventTitle}: tiny-silicon designs racing the beam.`;
  return [
    { title },
    { name: "description", content: description },
    { property: "og:title", content: title },
    { property: "og:description", content: description },
    { property: "og:type", content: "website" },
    ...(data.ogImage ? [{ property: "og:image", content: data.ogImage }] : []),
  ];
};

export default function Showcase({ loaderData }: Route.ComponentProps) {
  const { competition: c, entries } = loaderData;
  const base = `/e/${c.eventSlug}/${c.slug}`;
  return (
    <div>
      <p className="kicker">{c.eventTitle} · Showcase</p>
      <div className="mt-1 flex flex-wrap items-center gap-3">
        <h1 className="text-display font-extrabold">{c.title}</h1>
        <StateBadge state={c.state} />
      </div>
      <p className="mt-3 max-w-3xl text-ink-soft">{c.description}</p>
      <nav aria-label="Competition" className="mt-5 flex flex-wrap gap-2">
        <Link to={base} className="btn-quiet">
          Rules
        </Link>
        {c.state !== "results" && (
          <Link to={`${base}/vote`} className="btn-signal">
            Vote
          </Link>
        )}
        <Link to={`${base}/results`} className="btn-quiet">
          Results
        </Link>
      </nav>
      {c.crewsHidden && <p className="mt-4 text-sm text-mute">Judging is blind: crews are shown once the results are out.</p>}
      {entries.length === 0 ? (
        <p className="card mt-8 text-ink-soft">No entries to show yet.</p>
      ) : (
        <ol className="mt-8 grid gap-5 sm:grid-cols-2 lg:grid-cols-3" data-testid="showcase-entries">
          {entries.map((e) => (
            <li key={e.id} className="card flex flex-col p-0">
              <Link to={`${base}/entries/${e.id}`} className="group block rounded-xl focus-visible:outline-offset-4">
                <div className="relative aspect-[4/3] overflow-hidden rounded-t-xl bg-ink">
                  {e.media.still || e.media.firstFrame ? (
                    <img src={(e.media.still ?? e.media.firstFrame)!} alt="" className={`h-full w-full object-cover ${e.flash.verdict !== "pass" ? "opacity-60" : ""}`} loading="lazy" />
                  ) : (
                    <div className="flex h-full items-center justify-center p-4 text-center text-sm text-white/70">Reference capture not ready yet</div>
                  )}
                  <span className="absolute left-3 top-3 rounded bg-ink/80 px-2 py-0.5 font-mono text-xs text-white">#{e.position}</span>
                  {e.flash.verdict !== "pass" && (
                    <span className="absolute right-3 top-3 rounded bg-fail px-2 py-0.5 text-xs font-semibold text-white">
                      {e.flash.verdict === null ? "Flash not measured" : "Flashing"}
                    </span>
                  )}
                </div>
                <div className="p-4">
                  <h2 className="text-lg font-extrabold group-hover:text-signal">{e.title}</h2>
                  <p className="text-sm text-mute">{e.crew ?? "Crew hidden while judging"}</p>
                  <div className="mt-2 flex flex-wrap items-center gap-2 text-xs text-ink-soft">
                    <VerdictPill verdict={e.check.verdict} state={e.check.state} />
                    {e.stats.flipFlops !== null && <span>{e.stats.flipFlops} flip-flops</span>}
                    {e.stats.cells !== null && <span>· {e.stats.cells} cells</span>}
                  </div>
                </div>
              </Link>
            </li>
          ))}
        </ol>
      )}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
