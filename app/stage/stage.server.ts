import QRCode from "qrcode";
import { env } from "~/env.server";
import { publicAwardsOfCompetition } from "~/results/awards.server";
import { publishedResults } from "~/results/results.server";
import { isFlashFlagged } from "~/showcase/figures";
import type { StageScreen } from "./screens";
export type { StageScreen } from "./screens";
import { showcaseEntries, type PublicCompetition } from "~/showcase/showcase.server";

/**
 * The screens of stage mode, computed on the server in the order they are shown. The browser only moves a
 * cursor through this list with the keyboard.
 */
export function voteUrl(c: Pick<PublicCompetition, "eventSlug" | "slug">): string {
  return `${env().APP_URL.replace(/\/$/, "")}/e/${c.eventSlug}/${c.slug}/vote`;
}

export async function stageScreens(c: PublicCompetition): Promise<StageScreen[]> {
  const list = await showcaseEntries(c);
  const shown = c.stageFlashMode === "skip" ? list.filter((e) => !isFlashFlagged(e.flash)) : list;
  const screens: StageScreen[] = [
    { kind: "intro", eventTitle: c.eventTitle, title: c.title, description: c.description, entryCount: shown.length, skipped: list.length - shown.length },
  ];
  shown.forEach((e, i) => {
    const src = e.media.referenceWebm ?? e.media.referenceMp4;
    screens.push({
      kind: "entry",
      position: i + 1,
      total: shown.length,
      title: e.title,
      crew: e.crew,
      stats: e.stats,
      flash: e.flash,
      dimmed: isFlashFlagged(e.flash),
      video: src ? { src, type: e.media.referenceWebm ? "video/webm" : "video/mp4" } : null,
      poster: e.media.firstFrame ?? e.media.still,
    });
  });
  const url = voteUrl(c);
  // The QR code stays ink-on-white whatever the theme: phone cameras read dark modules on a light field best.
  const qrSvg = await QRCode.toString(url, { type: "svg", margin: 2, errorCorrectionLevel: "M", color: { dark: "#16131f", light: "#ffffff" } });
  screens.push({ kind: "vote", url, qrSvg, closesAt: c.votingClosesAt, timeZone: c.timeZone, method: c.ballotMethod });

  const published = c.state === "results" ? await publishedResults(c.id) : null;
  if (published) {
    const rows = [...published.payload.standings].reverse();
    screens.push({ kind: "reveal-intro", version: published.version, entryCount: rows.length });
    rows.forEach((r, i) =>
      screens.push({ kind: "reveal", place: r.place, tied: r.tied, title: r.title, crew: r.crew, mixed: r.mixed, juryScore: r.jury.score, audienceScore: r.audience.score, step: i + 1, steps: rows.length }),
    );
    // The party's special awards won in this compo follow the places.
    for (const a of await publicAwardsOfCompetition(c.eventId, c.id)) screens.push({ kind: "award", award: a.title, citation: a.citation, title: a.winner!.title, crew: a.winner!.crew });
  }
  screens.push({ kind: "end", title: c.title });
  return screens;
}
