import { z } from "zod";
import { apiError, apiJson, parseJsonBody, requireMethod } from "~/api/json.server";
import { competitionById } from "~/showcase/showcase.server";
import { resolveVoter } from "~/voting/page.server";
import { apiCall } from "~/errors/http.server";
import { castBallot, codeHolderCookie, currentBallot, windowStatus, type Voter } from "~/voting/voting.server";
import type { Route } from "./+types/api.ballots";

/**
 * /api/ballots/:competitionId
 *   GET  → { window, method, ballot | null }              (your own ballot only)
 *   PUT  { ballot: {points}|{ranking}, code? } → 200 { ballot, replaced }   (cast or replace)
 * Voters: a signed-in account with a verified e-mail, a browser holding a redeemed code (cookie), or `code`.
 */
const castSchema = z.object({ ballot: z.unknown(), code: z.string().max(40).optional() }).strict();

async function competition(params: { competitionId?: string }) {
  const c = params.competitionId ? await competitionById(params.competitionId) : null;
  if (!c || c.state === "draft") throw apiError(404, "not_found", "There is no such competition.");
  return c;
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const c = await competition(params);
  const { voter } = await resolveVoter(request, context, c.id);
  return apiJson({
    window: { status: windowStatus(c), opensAt: c.votingOpensAt, closesAt: c.votingClosesAt },
    method: c.ballotMethod,
    ballot: voter ? await currentBallot(c.id, voter) : null,
  });
}

export async function action({ request, params, context }: Route.ActionArgs) {
  requireMethod(request, ["PUT", "POST"]);
  const c = await competition(params);
  const { voter } = await resolveVoter(request, context, c.id);
  const body = await parseJsonBody(request, castSchema);
  let who: Voter;
  if (voter) who = voter;
  else if (body.code) who = { kind: "new-code", code: body.code };
  else return apiError(401, "no_voter", "Sign in with a verified account, or send the vote code from your slip as `code`.");
  const out = await apiCall(() => castBallot({ competitionId: c.id, voter: who, content: body.ballot }));
  const headers = new Headers();
  if (out.holderToken) headers.set("Set-Cookie", codeHolderCookie(c.id, out.holderToken, c.votingClosesAt ? new Date(c.votingClosesAt) : null));
  return apiJson({ ballot: out.content, replaced: out.replaced }, { headers });
}
