import { data } from "react-router";
import { env } from "~/env.server";
import { competitionBySlugs, showcaseIsOpen, type PublicCompetition } from "./showcase.server";

/** The public gate of showcase pages: a competition past draft, whose entries have closed. 404 otherwise. */
export async function requireShowcase(params: { eventSlug?: string; competitionSlug?: string }): Promise<PublicCompetition> {
  const c = params.eventSlug && params.competitionSlug ? await competitionBySlugs(params.eventSlug, params.competitionSlug) : null;
  if (!c) throw data({ message: "There is no such competition." }, { status: 404 });
  if (!showcaseIsOpen(c)) throw data({ message: "The showcase opens when entries close. Until then, see the rules page." }, { status: 404 });
  return c;
}

export function absoluteUrl(path: string | null): string | null {
  return path ? `${env().APP_URL.replace(/\/$/, "")}${path}` : null;
}

/** The competition fields a public page may carry. */
export function publicCompetitionView(c: PublicCompetition) {
  return {
    id: c.id,
    eventSlug: c.eventSlug,
    eventTitle: c.eventTitle,
    slug: c.slug,
    title: c.title,
    description: c.description,
    state: c.state,
    crewsHidden: c.crewsHidden,
    votingOpensAt: c.votingOpensAt,
    votingClosesAt: c.votingClosesAt,
    timeZone: c.timeZone,
  };
}
