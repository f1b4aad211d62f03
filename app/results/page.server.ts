import { data } from "react-router";
import { competitionBySlugs, type PublicCompetition } from "~/showcase/showcase.server";
import { publishedResults } from "./results.server";
import type { PublishedVersion } from "./shapes";

/** Public results: anyone, once a version is published. `?version=N` picks an older one. */
export async function requirePublicCompetition(params: { eventSlug?: string; competitionSlug?: string }): Promise<PublicCompetition> {
  const c = params.eventSlug && params.competitionSlug ? await competitionBySlugs(params.eventSlug, params.competitionSlug) : null;
  if (!c) throw data({ message: "There is no such competition." }, { status: 404 });
  return c;
}

export function requestedVersion(request: Request): number | undefined {
  const v = new URL(request.url).searchParams.get("version");
  if (v === null) return undefined;
  const n = Number(v);
  if (!Number.isInteger(n) || n < 1) throw data({ message: `"${v}" is not a results version.` }, { status: 400 });
  return n;
}

export async function requirePublished(request: Request, params: { eventSlug?: string; competitionSlug?: string }): Promise<{ competition: PublicCompetition; published: PublishedVersion }> {
  const competition = await requirePublicCompetition(params);
  const version = requestedVersion(request);
  const published = await publishedResults(competition.id, version);
  if (!published) throw data({ message: version ? `There is no version ${version} of these results.` : "The results are not out yet." }, { status: 404 });
  return { competition, published };
}
