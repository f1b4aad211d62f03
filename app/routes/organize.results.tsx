import { getFormProps, getTextareaProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, useNavigation } from "react-router";
import { FormErrors } from "~/components/FormField";
import { PrizeCaution, ShowcaseStandings } from "~/components/ShowcaseStandings";
import { METHOD_NAMES } from "~/results/format";
import { attempt, formReply } from "~/errors/http.server";
import { computeStandings, publishedVersions, publishResults } from "~/results/results.server";
import { requireCompetitionOrganizer } from "~/showcase/organizer.server";
import { publishSchema } from "~/voting/forms";
import { windowStatus } from "~/voting/voting.server";
import type { Route } from "./+types/organize.results";
import { readForm } from "~/api/body.server";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { competition: c } = await requireCompetitionOrganizer(request, context, params.competitionId);
  const preview = await computeStandings(c.id);
  return {
    competition: { id: c.id, title: c.title, eventTitle: c.eventTitle, eventSlug: c.eventSlug, slug: c.slug, state: c.state },
    voting: windowStatus(c),
    preview: { method: preview.method, counts: preview.counts, standings: preview.standings, rules: preview.rules },
    versions: await publishedVersions(c.id),
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, competition: c } = await requireCompetitionOrganizer(request, context, params.competitionId);
  const submission = parseWithZod(await readForm(request), { schema: publishSchema });
  if (submission.status !== "success") return { result: submission.reply(), published: null };
  const note = submission.value.note ?? "";
  const out = await attempt(() => publishResults(c.id, user.id, note));
  if (!out.ok) return { result: formReply(submission, out.error), published: null };
  return { result: submission.reply({ resetForm: true }), published: { version: out.value.version, sha256: out.value.sha256 } };
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `Results · ${data.competition.title} · Organize · Gatecrash` : "Results · Gatecrash" }];

export default function OrganizeResults({ loaderData, actionData }: Route.ComponentProps) {
  const { competition: c, voting, preview, versions } = loaderData;
  const nav = useNavigation();
  const [form, fields] = useForm({ lastResult: nav.state === "idle" ? actionData?.result : undefined, onValidate: ({ formData }) => parseWithZod(formData, { schema: publishSchema }) });
  const base = `/e/${c.eventSlug}/${c.slug}`;
  const correction = versions.length > 0;
  const canPublish = ["closed", "judging", "results"].includes(c.state);
  return (
    <div>
      <p className="kicker">Organize · {c.eventTitle}</p>
      <h1 className="mt-1 text-display font-extrabold">Results: {c.title}</h1>
      <nav aria-label="Competition tools" className="mt-4 flex flex-wrap gap-2">
        <Link className="btn-quiet" to={`/stage/${c.id}`}>Stage mode</Link>
        {correction && <Link className="btn-quiet" to={`${base}/results`}>Public results page</Link>}
      </nav>

      {actionData?.published && (
        <div role="status" className="mt-6 rounded-md border border-pass bg-pass-soft p-3 text-sm font-semibold text-pass" data-testid="published">
          Version {actionData.published.version} is published and frozen (SHA-256 {actionData.published.sha256.slice(0, 16)}…). Every entrant is being mailed.{" "}
          <Link to={`${base}/results`} className="underline">See the public page</Link>
        </div>
      )}

      <section className="card mt-6" aria-labelledby="preview-heading">
        <h2 id="preview-heading" className="font-extrabold">Preview — live standings, not published</h2>
        <p className="mt-1 text-sm text-mute">
          Jury {preview.method.juryWeightPct} % ({METHOD_NAMES[preview.method.jury]}), audience {preview.method.audienceWeightPct} % ({METHOD_NAMES[preview.method.audience]}). {preview.counts.entries} entries,{" "}
          {preview.counts.judges} judges, {preview.counts.scores} scores, {preview.counts.ballots} ballots
          {preview.counts.ballotsSetAside ? `, ${preview.counts.ballotsSetAside} set aside` : ""}.
        </p>
        {voting === "open" && (
          <p role="alert" className="mt-3 rounded-md border border-warn bg-warn-soft p-3 text-sm font-semibold text-warn">
            The audience vote is still open. Publishing moves the competition to results and ends the vote.
          </p>
        )}
        <div className="mt-4">
          <ShowcaseStandings rows={preview.standings} juryPct={preview.method.juryWeightPct} audiencePct={preview.method.audienceWeightPct} caption="As they stand right now." />
        </div>
        <details className="mt-4 text-sm text-ink-soft">
          <summary className="cursor-pointer font-semibold">How these are counted</summary>
          <ul className="mt-2 list-disc space-y-1 pl-5">{[...preview.rules.jury, ...preview.rules.mix].map((r) => <li key={r}>{r}</li>)}</ul>
        </details>
      </section>

      <section className="card mt-6" aria-labelledby="publish-heading">
        <h2 id="publish-heading" className="font-extrabold">{correction ? `Publish a correction (version ${versions[0].version + 1})` : "Publish the results"}</h2>
        <p className="mt-1 text-sm text-ink-soft">
          Publishing freezes these standings as they are now. A published version never changes; a correction is a new, visible version with a note.
        </p>
        {!canPublish ? (
          <p className="mt-3 text-sm text-mute">Results can be published once entries have closed.</p>
        ) : (
          <Form method="post" {...getFormProps(form)} className="mt-4 max-w-xl">
            <FormErrors errors={form.errors} />
            <label htmlFor={fields.note.id} className="label">
              {correction ? "What changed and why (shown with the new version)" : "Note (optional)"}
            </label>
            <textarea {...getTextareaProps(fields.note)} rows={3} className="field" aria-describedby={fields.note.errors ? `${fields.note.id}-error` : undefined} />
            {fields.note.errors && <p id={`${fields.note.id}-error`} className="field-error" role="alert">{fields.note.errors.join(" ")}</p>}
            <div className="mt-3 flex items-start gap-2">
              <input type="checkbox" id={fields.confirm.id} name={fields.confirm.name} value="yes" className="mt-1" aria-describedby={fields.confirm.errors ? `${fields.confirm.id}-error` : undefined} />
              <label htmlFor={fields.confirm.id} className="text-sm">I checked the preview. Publish it and mail every entrant their place.</label>
            </div>
            {fields.confirm.errors && <p id={`${fields.confirm.id}-error`} className="field-error" role="alert">{fields.confirm.errors.join(" ")}</p>}
            <button type="submit" className="btn-signal mt-4" disabled={nav.state !== "idle"}>
              {correction ? "Publish correction" : "Publish results"}
            </button>
          </Form>
        )}
      </section>

      {versions.length > 0 && (
        <section className="mt-6">
          <h2 className="font-extrabold">Published versions</h2>
          <ol className="mt-2 space-y-1 text-sm">
            {versions.map((v) => (
              <li key={v.version}>
                <Link className="font-semibold text-signal" to={`${base}/results?version=${v.version}`}>Version {v.version}</Link> · {new Date(v.publishedAt).toUTCString()} ·{" "}
                <code className="font-mono text-xs">{v.sha256.slice(0, 16)}…</code>
                {v.note && <span className="text-ink-soft"> · {v.note}</span>}
              </li>
            ))}
          </ol>
        </section>
      )}
      <div className="mt-8"><PrizeCaution /></div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
