import { getSession, type RequestContext } from "~/auth/guards.server";
import { codeHolderFromCookie, type Voter } from "./voting.server";

export type VoterState =
  | { kind: "account"; name: string; emailVerified: boolean }
  | { kind: "code" }
  | { kind: "anonymous" };

/**
 * Who is at the vote page: a signed-in account (verified or not), a browser that holds a redeemed vote code,
 * or someone who still has to type a code. A signed-in account wins over a code cookie.
 */
export async function resolveVoter(request: Request, context: RequestContext, competitionId: string): Promise<{ voter: Exclude<Voter, { kind: "new-code" }> | null; state: VoterState }> {
  const session = getSession(context);
  if (session) {
    return {
      voter: { kind: "user", userId: session.user.id, emailVerified: session.user.emailVerified },
      state: { kind: "account", name: session.user.name, emailVerified: session.user.emailVerified },
    };
  }
  const codeId = await codeHolderFromCookie(competitionId, request.headers.get("cookie"));
  if (codeId) return { voter: { kind: "code", codeId }, state: { kind: "code" } };
  return { voter: null, state: { kind: "anonymous" } };
}
