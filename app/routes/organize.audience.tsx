import { getFormProps, getInputProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useEffect } from "react";
import { Form, Link, useNavigation, useRevalidator } from "react-router";
import { audit } from "~/audit/log.server";
import { FormErrors } from "~/components/FormField";
import { requireCompetitionOrganizer } from "~/showcase/organizer.server";
import { codeSheetSchema } from "~/voting/forms";
import { generateVoteCodes, liveCount } from "~/voting/voting.server";
import type { Route } from "./+types/organize.audience";
import { readForm } from "~/api/body.server";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { competition: c } = await requireCompetitionOrganizer(request, context, params.competitionId);
  return {
    competition: { id: c.id, title: c.title, eventTitle: c.eventTitle, eventSlug: c.eventSlug, slug: c.slug, method: c.ballotMethod, opensAt: c.votingOpensAt, closesAt: c.votingClosesAt, timeZone: c.timeZone },
    count: await liveCount(c.id),
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, competition: c } = await requireCompetitionOrganizer(request, context, params.competitionId);
  const submission = parseWithZod(await readForm(request), { schema: codeSheetSchema });
  if (submission.status !== "success") return { result: submission.reply(), made: 0 };
  const codes = await generateVoteCodes(c.id, submission.value.count);
  await audit({ actorUserId: user.id, eventId: c.eventId, action: "vote-codes.generated", subjectType: "competition", subjectId: c.id, details: { count: codes.length } });
  return { result: submission.reply({ resetForm: true }), made: codes.length };
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `Audience vote · ${data.competition.title} · Gatecrash` : "Audience vote · Gatecrash" }];

const STATUS = { "not-open": "Not open yet", open: "Open now", closed: "Closed" };

export default function OrganizeAudience({ loaderData, actionData }: Route.ComponentProps) {
  const { competition: c, count } = loaderData;
  const nav = useNavigation();
  const revalidator = useRevalidator();
  const [form, fields] = useForm({ lastResult: nav.state === "idle" ? actionData?.result : undefined, onValidate: ({ formData }) => parseWithZod(formData, { schema: codeSheetSchema }) });
  // The live count refreshes itself every 10 s while the vote is open.
  useEffect(() => {
    if (count.status !== "open") return;
    const t = setInterval(() => revalidator.state === "idle" && revalidator.revalidate(), 10_000);
    return () => clearInterval(t);
  }, [count.status, revalidator]);
  const fmt = (iso: string | null) => (iso ? new Date(iso).toLocaleString("en-GB", { timeZone: c.timeZone, dateStyle: "medium", timeStyle: "short" }) : "not set");

  return (
    <div>
      <p className="kicker">Organize · {c.eventTitle}</p>
      <h1 className="mt-1 text-display font-extrabold">Audience vote: {c.title}</h1>
      <p className="mt-2 text-sm text-mute">
        {STATUS[count.status]} · {fmt(c.opensAt)} → {fmt(c.closesAt)} ({c.timeZone}) · method: {c.method}. Only you see this count.
      </p>
      <nav aria-label="Competition tools" className="mt-4 flex flex-wrap gap-2">
        <Link className="btn-quiet" to={`/e/${c.eventSlug}/${c.slug}/vote`}>
          The vote page
        </Link>
        <Link className="btn-quiet" to={`/stage/${c.id}`}>
          Stage mode
        </Link>
      </nav>

      <section aria-labelledby="count-heading" className="mt-8 grid gap-6 lg:grid-cols-[2fr_3fr]">
        <div className="card">
          <h2 id="count-heading" className="font-extrabold">
            Live count
          </h2>
          <dl className="mt-3 grid grid-cols-2 gap-3" data-testid="live-count">
            {[
              ["Ballots", count.ballots],
              ["From accounts", count.byAccounts],
              ["From codes", count.byCodes],
              ["Changes", count.changes],
              ["Codes issued", count.codesIssued],
              ["Codes used", count.codesRedeemed],
            ].map(([k, v]) => (
              <div key={k}>
                <dt className="text-xs font-semibold uppercase tracking-wider text-mute">{k}</dt>
                <dd className="text-2xl font-extrabold tabular-nums">{v}</dd>
              </div>
            ))}
          </dl>
        </div>
        <div className="card">
          <h2 className="font-extrabold">Audience standings right now</h2>
          <table className="mt-3 w-full text-sm">
            <thead>
              <tr className="text-left text-xs uppercase tracking-wider text-mute">
                <th scope="col" className="py-1">Place</th>
                <th scope="col">Entry</th>
                <th scope="col" className="text-right">Score</th>
              </tr>
            </thead>
            <tbody>
              {count.standings.map((r) => (
                <tr key={r.candidate} className="border-t border-line">
                  <td className="py-1 font-semibold tabular-nums">{r.tied ? `${r.place}=` : r.place}</td>
                  <td>{r.title}</td>
                  <td className="text-right tabular-nums">{r.score === null ? "—" : r.score.toFixed(2)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </section>

      <section aria-labelledby="codes-heading" className="card mt-8">
        <h2 id="codes-heading" className="font-extrabold">
          Vote codes for the hall
        </h2>
        <p className="mt-1 text-sm text-ink-soft">
          Each code makes one ballot. The browser that used it may change that ballot until the vote closes; nobody can use the code
          again. Hand them out at the door.
        </p>
        <Form method="post" {...getFormProps(form)} className="mt-4 flex flex-wrap items-end gap-3">
          <FormErrors errors={form.errors} />
          <div>
            <label htmlFor={fields.count.id} className="label">
              How many new codes
            </label>
            <input {...getInputProps(fields.count, { type: "number" })} min={1} max={500} className="field w-32" aria-describedby={fields.count.errors ? `${fields.count.id}-error` : undefined} />
            {fields.count.errors && (
              <p id={`${fields.count.id}-error`} className="field-error" role="alert">
                {fields.count.errors.join(" ")}
              </p>
            )}
          </div>
          <button type="submit" className="btn-primary" disabled={nav.state !== "idle"}>
            Generate codes
          </button>
          {actionData?.made ? (
            <p role="status" className="text-sm font-semibold text-pass">
              {actionData.made} new codes made.
            </p>
          ) : null}
        </Form>
        <div className="mt-4 flex flex-wrap gap-2">
          <a className="btn-quiet" href={`/organize/${c.id}/audience/codes`} target="_blank" rel="noreferrer">
            Printable sheet of unused codes
          </a>
          <a className="btn-quiet" href={`/organize/${c.id}/audience/codes.csv`}>
            All codes as CSV
          </a>
        </div>
      </section>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
