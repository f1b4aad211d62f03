import QRCode from "qrcode";
import { env } from "~/env.server";
import { publicAwardsOfCompetition } from "~/results/awards.server";
import { publishedResults } from "~/results/results.server";
import type { StageScreen } from "./screens";
export type { StageScreen } from "./screens";
import type { PublicCompetition } from "~/showcase/showcase.server";
import { runningOrder } from "./running-order.server";

/**
 * The screens of stage mode, computed on the server in the order they are shown. The browser only moves a
 * cursor through this list with the keyboard.
 */
export function voteUrl(c: Pick<PublicCompetition, "eventSlug" | "slug">): string {
  return `${env().APP_URL.replace(/\/$/, "")}/e/${c.eventSlug}/${c.slug}/vote`;
}

export async function stageScreens(c: PublicCompetition): Promise<StageScreen[]> {
  const order = await runningOrder(c);
  const shown = order.filter((r) => r.onStage);
  const screens: StageScreen[] = [
    { kind: "intro", eventTitle: c.eventTitle, title: c.title, description: c.description, entryCount: shown.length, heldBack: order.length - shown.length },
  ];
  shown.forEach((r, i) => {
    // A flagged entry is here only on a sign-off, and then always behind its own warning slide.
    if (r.flagged && r.signOff) screens.push({ kind: "flash-warning", title: r.entry.title, flash: r.flash, signOff: r.signOff, timeZone: c.timeZone });
    screens.push({
      kind: "entry",
      position: i + 1,
      total: shown.length,
      title: r.entry.title,
      crew: r.entry.crew,
      stats: r.entry.stats,
      flash: r.flash,
      flagged: r.flagged,
      video: r.video,
      poster: r.source === "reference" ? (r.entry.media.firstFrame ?? r.entry.media.still) : r.entry.media.still,
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
