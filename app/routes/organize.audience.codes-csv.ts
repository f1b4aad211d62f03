import { toCsv } from "~/security/csv";
import { requireCompetitionOrganizer } from "~/showcase/organizer.server";
import { voteCodesOf } from "~/voting/voting.server";
import type { Route } from "./+types/organize.audience.codes-csv";

/** Every vote code of the competition as CSV (code, created_at, redeemed_at). */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { competition: c } = await requireCompetitionOrganizer(request, context, params.competitionId);
  const rows = await voteCodesOf(c.id);
  const body = toCsv(["code", "created_at", "redeemed_at"], rows.map((r) => [r.code, r.createdAt, r.redeemedAt]));
  return new Response(body, {
    headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="vote-codes-${c.slug}.csv"`, "Cache-Control": "no-store" },
  });
}
