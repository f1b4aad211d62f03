import { Link } from "react-router";
import { AudioCaution, PlayerGate, type PlayerSource } from "~/components/PlayerGate";
import { ShowcaseStats, VerdictPill } from "~/components/ShowcaseStats";
import { absoluteUrl, publicCompetitionView, requireShowcase } from "~/showcase/page.server";
import { publishedShowcase } from "~/showcase/published.server";
import { markPublicPage } from "~/security/public-page.server";
import type { Route } from "./+types/showcase.entry";
import { data } from "react-router";

export async function loader({ params, context }: Route.LoaderArgs) {
  const c = await requireShowcase(params);
  const { version, entries } = await publishedShowcase(c);
  const entry = entries.find((e) => e.id === params.entryId);
  if (!entry) throw data({ message: "This entry is not in the showcase." }, { status: 404 });
  markPublicPage(context, version);
  return { competition: publicCompetitionView(c), entry, ogImage: absoluteUrl(entry.media.still ?? entry.media.firstFrame) };
}

export const meta: Route.MetaFunction = ({ data: d }) => {
  if (!d) return [{ title: "Entry · Gatecrash" }];
  const title = `${d.entry.title}${d.entry.crew ? ` by ${d.entry.crew}` : ""} · ${d.competition.title} · Gatecrash`;
  const description = d.entry.description.slice(0, 200) || `Entry #${d.entry.position} of ${d.competition.title}.`;
  return [
    { title },
    { name: "description", content: description },
    { property: "og:title", content: title },
    { property: "og:description", content: description },
    { property: "og:type", content: "article" },
    ...(d.ogImage ? [{ property: "og:image", content: d.ogImage }] : []),
  ];
};

export default function ShowcaseEntryPage({ loaderData }: Route.ComponentProps) {
  const { competition: c, entry: e } = loaderData;
  const base = `/e/${c.eventSlug}/${c.slug}`;
  const reference: PlayerSource[] = [
    ...(e.media.referenceWebm ? [{ src: e.media.referenceWebm, type: "video/webm" }] : []),
    ...(e.media.referenceMp4 ? [{ src: e.media.referenceMp4, type: "video/mp4" }] : []),
  ];
  const capture: PlayerSource[] = e.media.captureVideo ? [{ src: e.media.captureVideo, type: e.media.captureMediaType ?? "video/webm" }] : [];
  return (
    <article>
      <nav aria-label="Breadcrumb" className="text-sm text-mute">
        <Link to={`${base}/showcase`} className="hover:text-signal">
          ← {c.title} showcase
        </Link>
      </nav>
      <p className="kicker mt-4">Entry #{e.position}</p>
      <h1 className="mt-1 text-display font-extrabold">{e.title}</h1>
      <p className="mt-1 text-lg text-ink-soft">{e.crew ? `by ${e.crew}` : "Crew hidden while judging is blind"}</p>
      <div className="mt-3 flex flex-wrap items-center gap-2">
        <VerdictPill verdict={e.check.verdict} state={e.check.state} />
        <span className={`rounded-full px-2.5 py-0.5 text-xs font-semibold ${e.flash.verdict === "pass" ? "bg-pass-soft text-pass" : "bg-fail-soft text-fail"}`}>
          {e.flash.verdict === "pass" ? "Flash check passed" : e.flash.verdict === null ? "Flash not measured yet" : "Flashing: see warning"}
        </span>
      </div>
      {e.description && <p className="mt-4 max-w-3xl whitespace-pre-line">{e.description}</p>}

      <div className="mt-8 grid gap-8 lg:grid-cols-[3fr_2fr]">
        <section aria-labelledby="reference-heading">
          <h2 id="reference-heading" className="mb-3 text-xl font-extrabold">
            Reference capture
          </h2>
          <p className="mb-3 text-sm text-mute">Rendered by Gatecrash from the design itself, the same way for every entry.</p>
          <PlayerGate
            label="Reference capture"
            sources={reference}
            poster={e.media.firstFrame}
            flashVerdict={e.flash.verdict}
            flashStatement={e.flash.statement}
            loop={e.loop?.detected && e.loop.periodSeconds !== null ? { startSeconds: e.loop.loopStartSeconds ?? 0, periodSeconds: e.loop.periodSeconds } : null}
          />
          {e.loop?.statement && <p className="mt-2 text-sm text-mute">Whole demo: {e.loop.statement}.</p>}
          {e.media.referenceAudio && (
            <div className="mt-4">
              <AudioCaution className="mb-2 text-sm" />
              <a href={e.media.referenceAudio} className="btn-quiet">
                Download the reference audio (WAV)
              </a>
            </div>
          )}
          <h2 className="mb-3 mt-10 text-xl font-extrabold">The crew's capture</h2>
          <PlayerGate
            label="Crew's capture video"
            sources={capture}
            flashVerdict={e.captureFlash.verdict}
            flashStatement={e.captureFlash.statement}
            notReady="This crew uploaded no capture video."
          />
        </section>
        <aside className="space-y-6">
          <div className="card">
            <h2 className="mb-3 font-extrabold">Figures</h2>
            <ShowcaseStats stats={e.stats} />
          </div>
          {e.media.still && (
            <div className="card">
              <h2 className="mb-3 font-extrabold">Still</h2>
              <img src={e.media.still} alt={`Still of ${e.title}`} className="w-full rounded" loading="lazy" />
            </div>
          )}
          <div className="card">
            <h2 className="mb-3 font-extrabold">Layout</h2>
            {e.media.layoutPicture ? (
              <img src={e.media.layoutPicture} alt={`Layout picture of ${e.title}: the tile's cells and density`} className="w-full rounded bg-ink" loading="lazy" />
            ) : (
              <p className="text-sm text-mute">Layout picture not ready yet.</p>
            )}
          </div>
        </aside>
      </div>
    </article>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
