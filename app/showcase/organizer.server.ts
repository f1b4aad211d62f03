import { data } from "react-router";
import { requireEventRole, type SessionUser } from "~/auth/guards.server";
import { competitionById, type PublicCompetition } from "./showcase.server";

/** Organizer pages of one competition (audience, results, stage): the event's organizers and platform admins only. */
export async function requireCompetitionOrganizer(request: Request, competitionId: string | undefined): Promise<{ user: SessionUser; competition: PublicCompetition }> {
  const c = competitionId ? await competitionById(competitionId) : null;
  if (!c) throw data({ message: "There is no such competition." }, { status: 404 });
  const { user } = await requireEventRole(request, c.eventId, ["organizer"]);
  return { user, competition: c };
}
