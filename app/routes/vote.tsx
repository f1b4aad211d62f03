import { getFormProps, getInputProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useNavigation } from "react-router";
import { PointsInputs, RankedInputs } from "~/components/BallotInputs";
import { FormErrors } from "~/components/FormField";
import { competitionBySlugs } from "~/showcase/showcase.server";
import { showcaseEntries } from "~/showcase/showcase.server";
import { ballotFromForm, voteFormSchema } from "~/voting/forms";
import { resolveVoter } from "~/voting/page.server";
import { attempt, formReply } from "~/errors/http.server";
import { castBallot, codeHolderCookie, currentBallot, windowStatus, type Voter } from "~/voting/voting.server";
import type { Route } from "./+types/vote";
import { readForm } from "~/api/body.server";

async function requireVotePage(params: { eventSlug?: string; competitionSlug?: string }) {
  const c = params.eventSlug && params.competitionSlug ? await competitionBySlugs(params.eventSlug, params.competitionSlug) : null;
  if (!c) throw data({ message: "There is no such competition." }, { status: 404 });
  return c;
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const c = await requireVotePage(params);
  const now = new Date();
  const status = windowStatus(c, now);
  const { voter, state } = await resolveVoter(request, context, c.id);
  const ballot = voter ? await currentBallot(c.id, voter) : null;
  const list = status === "open" ? await showcaseEntries(c) : [];
  return {
    competition: { id: c.id, title: c.title, eventTitle: c.eventTitle, eventSlug: c.eventSlug, slug: c.slug, method: c.ballotMethod, timeZone: c.timeZone },
    window: { status, opensAt: c.votingOpensAt, closesAt: c.votingClosesAt, now: now.toISOString() },
    voter: state,
    ballot,
    entries: list.map((e) => ({ id: e.id, title: e.title, crew: e.crew, position: e.position })),
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const c = await requireVotePage(params);
  const submission = parseWithZod(await readForm(request), { schema: voteFormSchema });
  if (submission.status !== "success") return { result: submission.reply(), saved: null };
  const { voter, state } = await resolveVoter(request, context, c.id);
  let who: Voter;
  if (voter) who = voter;
  else if (submission.value.code) who = { kind: "new-code", code: submission.value.code };
  else return { result: submission.reply({ fieldErrors: { code: ["Type the vote code from your slip, or sign in with a verified account."] } }), saved: null };
  const content = ballotFromForm(c.ballotMethod, submission.value);
  const cast = await attempt(() => castBallot({ competitionId: c.id, voter: who, content }));
  if (!cast.ok) return { result: formReply(submission, cast.error), saved: null };
  const out = cast.value;
  const headers = out.holderToken ? { "Set-Cookie": codeHolderCookie(c.id, out.holderToken, c.votingClosesAt ? new Date(c.votingClosesAt) : null) } : undefined;
  return data({ result: submission.reply(), saved: { replaced: out.replaced, at: new Date().toISOString(), as: state.kind } }, { headers });
}

export const meta: Route.MetaFunction = ({ data: d }) => [
  { title: d ? `Vote · ${d.competition.title} · Gatecrash` : "Vote · Gatecrash" },
  { name: "description", content: d ? `The audience vote of ${d.competition.title} at ${d.competition.eventTitle}.` : "Audience vote." },
];

function when(iso: string | null, tz: string): string {
  return iso ? new Date(iso).toLocaleString("en-GB", { timeZone: tz, dateStyle: "medium", timeStyle: "short" }) + ` (${tz})` : "not set";
}

const METHOD_HELP = {
  points: "Give each entry 0 to 5 points. Entries you leave unrated get nothing from you.",
  borda: "Rank the entries. Counted by Borda: every place below an entry earns it a point.",
  schulze: "Rank the entries. Counted by Schulze: the entry that beats every other one head-to-head, by the strongest paths, wins.",
};

export default function Vote({ loaderData, actionData }: Route.ComponentProps) {
  const { competition: c, window: w, voter, ballot, entries } = loaderData;
  const nav = useNavigation();
  const [form, fields] = useForm({
    lastResult: nav.state === "idle" ? actionData?.result : undefined,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: voteFormSchema }),
  });
  const base = `/e/${c.eventSlug}/${c.slug}`;
  const content = ballot?.content as { points?: Record<string, number>; ranking?: string[] } | undefined;
  const needsCode = voter.kind === "anonymous";
  const unverified = voter.kind === "account" && !voter.emailVerified;
  const saved = actionData?.saved;

  return (
    <div className="mx-auto max-w-3xl">
      <p className="kicker">{c.eventTitle} · Audience vote</p>
      <h1 className="mt-1 text-display font-extrabold">{c.title}</h1>
      <p className="mt-2 text-sm text-mute">
        Open {when(w.opensAt, c.timeZone)} until {when(w.closesAt, c.timeZone)}.{" "}
        <Link to={`${base}/showcase`} className="font-semibold text-signal">
          Watch the entries first
        </Link>
      </p>

      {w.status !== "open" ? (
        <div className="card mt-8" data-testid="vote-closed">
          <h2 className="text-xl font-extrabold">{w.status === "not-open" ? "The vote has not opened yet" : "The vote is closed"}</h2>
          <p className="mt-2 text-ink-soft">
            {w.status === "not-open" ? `Come back when it opens: ${when(w.opensAt, c.timeZone)}.` : "Thank you for watching. "}
            {w.status === "closed" && (
              <Link to={`${base}/results`} className="font-semibold text-signal">
                See the results
              </Link>
            )}
          </p>
        </div>
      ) : unverified ? (
        <div className="card mt-8" role="alert">
          <h2 className="text-xl font-extrabold">Confirm your e-mail address to vote</h2>
          <p className="mt-2 text-ink-soft">Only accounts with a confirmed address vote. Open the link we mailed you, then come back.</p>
        </div>
      ) : (
        <Form method="post" {...getFormProps(form)} className="mt-8" data-testid="vote-form">
          {saved && (
            <div role="status" className="mb-4 rounded-md border border-pass bg-pass-soft px-3 py-2 text-sm font-semibold text-pass" data-testid="vote-saved">
              {saved.replaced ? "Your ballot was changed." : "Your ballot is in."} You can change it until the vote closes.
            </div>
          )}
          <FormErrors errors={form.errors} />
          {ballot && !saved && <p className="mb-4 text-sm text-ink-soft">You voted already; sending again replaces your ballot.</p>}
          <p className="mb-4 text-sm text-ink-soft">{METHOD_HELP[c.method]}</p>
          {needsCode && (
            <div className="card mb-6">
              <label htmlFor={fields.code.id} className="label">
                Vote code
              </label>
              <input {...getInputProps(fields.code, { type: "text" })} className="field max-w-xs font-mono uppercase tracking-widest" autoComplete="off" placeholder="XXXX-XXXX" aria-describedby={`${fields.code.id}-hint ${fields.code.errors ? `${fields.code.id}-error` : ""}`} />
              <p id={`${fields.code.id}-hint`} className="mt-1 text-xs text-mute">
                From your slip at the party. Or{" "}
                <Link to={`/sign-in?next=${encodeURIComponent(`${base}/vote`)}`} className="font-semibold text-signal">
                  sign in
                </Link>{" "}
                with a verified account.
              </p>
              {fields.code.errors && (
                <p id={`${fields.code.id}-error`} className="field-error" role="alert">
                  {fields.code.errors.join(" ")}
                </p>
              )}
            </div>
          )}
          {entries.length === 0 ? (
            <p className="card">No entries to vote on.</p>
          ) : c.method === "points" ? (
            <PointsInputs entries={entries} initial={content?.points ?? {}} disabled={false} />
          ) : (
            <RankedInputs entries={entries} initial={content?.ranking ?? []} disabled={false} />
          )}
          <button type="submit" className="btn-signal mt-6" disabled={nav.state !== "idle" || entries.length === 0}>
            {ballot ? "Change my ballot" : "Cast my ballot"}
          </button>
        </Form>
      )}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
