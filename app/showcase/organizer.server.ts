import type { RequestContext, SessionUser } from "~/auth/guards.server";
import { requireCompetitionRole } from "~/competitions/access.server";
import { publicView, type PublicCompetition } from "./showcase.server";

/**
 * Organizer pages of one competition (audience, results, stage): the permission check comes first (404 for anyone
 * who does not organize it, admins excepted), and only then the competition in the showcase's shape.
 */
export async function requireCompetitionOrganizer(request: Request, context: RequestContext, competitionId: string | undefined): Promise<{ user: SessionUser; competition: PublicCompetition }> {
  const { user, competition, event } = await requireCompetitionRole(request, context, competitionId, "organizer");
  return { user, competition: publicView(competition, event) };
}
