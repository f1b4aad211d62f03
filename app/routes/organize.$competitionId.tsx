import { data, Form, Link, useActionData, useNavigation } from "react-router";
import { z } from "zod";
import { requireCompetitionRole } from "~/competitions/access.server";
import { formatFee } from "~/competitions/forms";
import { COMPETITION_STATES, TRANSITION_LABELS, TRANSITIONS, transitionProblem } from "~/competitions/lifecycle";
import { cutoffOf } from "~/entries/deadline";
import { entryCounts, moveCompetition } from "~/competitions/service.server";
import { formatInZone } from "~/competitions/timezone";
import { StateBadge } from "~/components/StateBadge";
import { actionError, attempt } from "~/errors/http.server";
import type { Route } from "./+types/organize.$competitionId";
import { readForm } from "~/api/body.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.competition.title ?? "Compo"} · Organize · Gatecrash` }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { competition: c, event } = await requireCompetitionRole(request, context, params.competitionId, "organizer");
  const now = new Date();
  const moves = TRANSITIONS[c.state]
    .filter((to) => to !== "results")
    .map((to) => ({ to, label: TRANSITION_LABELS[`${c.state}>${to}`] ?? to, problem: transitionProblem(c, to, now) }));
  const fmt = (d: Date | null) => (d ? formatInZone(d, event.timeZone) : null);
  return {
    competition: {
      id: c.id,
      title: c.title,
      slug: c.slug,
      state: c.state,
      deadline: fmt(c.deadlineAt),
      uploadsStop: fmt(cutoffOf(c.deadlineAt, c.graceMinutes)),
      graceMinutes: c.graceMinutes,
      votingOpens: fmt(c.votingOpensAt),
      votingCloses: fmt(c.votingClosesAt),
      fee: formatFee(c.feeAmount, c.feeCurrency),
      rulesetVersion: c.rulesetVersion,
    },
    event: { id: event.id, slug: event.slug, title: event.title, timeZone: event.timeZone },
    counts: await entryCounts(c.id),
    moves,
  };
}

const moveSchema = z.object({ intent: z.literal("move"), to: z.enum(COMPETITION_STATES) });

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, competition } = await requireCompetitionRole(request, context, params.competitionId, "organizer");
  const parsed = moveSchema.safeParse(Object.fromEntries(await readForm(request)));
  if (!parsed.success) return data({ error: "Pick one of the offered moves." }, { status: 400 });
  const { to } = parsed.data;
  const moved = await attempt(() => moveCompetition(user.id, competition, to));
  if (!moved.ok) return data(actionError(moved.error), { status: moved.error.status });
  return { ok: true as const, error: null };
}

export default function CompetitionDashboard({ loaderData }: Route.ComponentProps) {
  const actionData = useActionData<typeof action>();
  const nav = useNavigation();
  const { competition: c, event, counts, moves } = loaderData;
  const base = `/organize/${c.id}`;
  const publicUrl = `/e/${event.slug}/${c.slug}`;
  return (
    <div data-testid="competition-dashboard">
      <p className="kicker">
        <Link to={`/organize/events/${event.id}`}>{event.title}</Link>
      </p>
      <div className="mb-6 mt-1 flex flex-wrap items-center gap-3">
        <h1 className="text-display font-extrabold">{c.title}</h1>
        <StateBadge state={c.state} />
      </div>

      {actionData?.error && (
        <p role="alert" className="mb-4 rounded-md border border-fail bg-fail-soft px-3 py-2 text-sm font-medium text-fail">
          {actionData.error}
        </p>
      )}

      <div className="grid gap-4 lg:grid-cols-3">
        <section className="card lg:col-span-2" aria-labelledby="lifecycle-h">
          <h2 id="lifecycle-h" className="mb-3 text-lg font-bold">
            Lifecycle
          </h2>
          <ol className="mb-4 flex flex-wrap gap-2 text-sm" aria-label="States">
            {["draft", "open", "closed", "judging", "results"].map((s) => (
              <li key={s} aria-current={s === c.state ? "step" : undefined} className={`rounded-full px-3 py-1 ${s === c.state ? "bg-ink text-paper font-semibold" : "bg-line/60 text-ink-soft"}`}>
                {s}
              </li>
            ))}
          </ol>
          {moves.length === 0 && c.state !== "judging" && <p className="text-sm text-mute">Nothing further to move: results are out.</p>}
          <div className="flex flex-wrap gap-3">
            {moves.map((m) => (
              <Form method="post" key={m.to}>
                <input type="hidden" name="intent" value="move" />
                <input type="hidden" name="to" value={m.to} />
                <button type="submit" className={m.to === "open" ? "btn-signal" : "btn-primary"} disabled={nav.state !== "idle" || !!m.problem} aria-describedby={m.problem ? `why-${m.to}` : undefined}>
                  {m.label}
                </button>
                {m.problem && (
                  <p id={`why-${m.to}`} className="mt-1 max-w-xs text-xs text-warn">
                    {m.problem}
                  </p>
                )}
              </Form>
            ))}
            {c.state === "judging" && (
              <Link to={`${base}/results`} className="btn-primary">
                Publish results…
              </Link>
            )}
          </div>
          <dl className="mt-5 grid grid-cols-2 gap-x-4 gap-y-2 text-sm sm:grid-cols-3">
            <div>
              <dt className="text-mute">Deadline ({event.timeZone})</dt>
              <dd className="font-semibold">{c.deadline ?? "not set"}</dd>
            </div>
            <div>
              <dt className="text-mute">Uploads count until</dt>
              <dd className="font-semibold">{c.uploadsStop ?? "—"}</dd>
            </div>
            <div>
              <dt className="text-mute">Voting</dt>
              <dd className="font-semibold">{c.votingOpens ? `${c.votingOpens} – ${c.votingCloses}` : "not set"}</dd>
            </div>
            <div>
              <dt className="text-mute">Fee</dt>
              <dd className="font-semibold">{c.fee}</dd>
            </div>
            <div>
              <dt className="text-mute">Ruleset</dt>
              <dd className="font-semibold">version {c.rulesetVersion}</dd>
            </div>
            <div>
              <dt className="text-mute">Entries</dt>
              <dd className="font-semibold" data-testid="entry-count">
                {counts.active} active{counts.disqualified ? `, ${counts.disqualified} disqualified` : ""}
              </dd>
            </div>
          </dl>
        </section>

        <nav className="card" aria-labelledby="tools-h">
          <h2 id="tools-h" className="mb-3 text-lg font-bold">
            Tools
          </h2>
          <ul className="space-y-2 text-sm font-semibold">
            <li><a className="text-signal" href={`${base}/ruleset.json`} download>Export ruleset.json</a></li>
            <li><Link className="text-signal" to={publicUrl}>{c.state === "draft" ? "Preview the public rules page" : "Public rules page"}</Link></li>
          </ul>
        </nav>
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
