import { getFormProps, getTextareaProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useActionData } from "react-router";
import { requireUser } from "~/auth/guards.server";
import type { RequestContext } from "~/auth/guards.server";
import { ScoringEntryMedia } from "~/components/ScoringEntryMedia";
import { latestCheckFor } from "~/conformance/report.server";
import { LateExceptionNotice } from "~/components/LateExceptionCard";
import { lateNoteForJury } from "~/entries/late-exception.server";
import { competitionForJudge } from "~/judging/access.server";
import { conflictReasonSchema } from "~/judging/forms";
import { entryForJudge } from "~/judging/grid.server";
import { pageCall } from "~/errors/http.server";
import { declareConflict } from "~/judging/jury.server";
import { FIGURE_SECTIONS, figureRows } from "~/judging/presentation";
import { flashSummary } from "~/showcase/figures";
import type { Route } from "./+types/judging.$competitionId.entries.$entryId";
import { readForm } from "~/api/body.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.entry.title ?? "Entry"} · Judging · Gatecrash` }];

async function judgeAndEntry(request: Request, context: RequestContext, params: { competitionId?: string; entryId?: string }) {
  const user = await requireUser(request, context);
  const c = await competitionForJudge(user.id, params.competitionId);
  if (!c) throw data({ message: "This compo is not among the ones you judge." }, { status: 404 });
  const entry = await entryForJudge(user.id, c, params.entryId);
  if (entry === "conflict") throw data({ message: "You have a conflict with this entry, so it is not shown to you and you cannot score it." }, { status: 404 });
  if (!entry) throw data({ message: "This entry is not on your grid." }, { status: 404 });
  return { user, c, entry };
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { c, entry } = await judgeAndEntry(request, context, params);
  const check = await latestCheckFor(entry.id);
  const figures = check?.run?.figures ?? {};
  const a = check?.artifacts ?? {};
  const pick = (k: string) => (a[k] ? { url: a[k].url, mediaType: a[k].mediaType } : null);
  return {
    competition: { id: c.id, title: c.title, timeZone: c.timeZone },
    entry,
    late: await lateNoteForJury(entry.id),
    check: check?.run
      ? {
          state: check.run.state,
          verdict: check.run.verdict,
          uploadNumber: check.uploadNumber,
          findings: check.findings.filter((f) => f.verdict !== "pass").map((f) => ({ rule: f.rule, verdict: f.verdict, title: f.title, measured: f.measured, limit: f.limit })),
          passCount: check.findings.filter((f) => f.verdict === "pass").length,
        }
      : null,
    flash: flashSummary(figures),
    stats: FIGURE_SECTIONS.map(([key, label]) => ({ label, rows: figureRows(figures, key) })).filter((s) => s.rows.length > 0),
    media: {
      video: pick("webm") ?? pick("mp4"),
      audio: pick("wav"),
      still: pick("first-frame"),
      contactSheet: pick("contact-sheet"),
      layout: pick("layout-svg") ?? pick("layout-png"),
      waveform: pick("waveform"),
    },
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, c, entry } = await judgeAndEntry(request, context, params);
  const submission = parseWithZod(await readForm(request), { schema: conflictReasonSchema });
  if (submission.status !== "success") return submission.reply();
  await pageCall(() => declareConflict(c, { entryId: entry.id, judgeUserId: user.id, reason: submission.value.reason, declaredBy: user.id }));
  throw redirect(`/judging/${c.id}?declared=1`);
}

const VERDICT: Record<string, string> = { pass: "bg-pass-soft text-pass", warn: "bg-warn-soft text-warn", fail: "bg-fail-soft text-fail" };

export default function JudgeEntry({ loaderData }: Route.ComponentProps) {
  const { competition: c, entry, check, flash, stats, media, late } = loaderData;
  const lastResult = useActionData<typeof action>();
  const [form, fields] = useForm({ lastResult, shouldValidate: "onBlur", onValidate: ({ formData }) => parseWithZod(formData, { schema: conflictReasonSchema }) });
  return (
    <div data-testid="judge-entry">
      <nav aria-label="Entries" className="mb-4 flex flex-wrap items-center gap-3 text-sm">
        <Link to={`/judging/${c.id}`} className="btn-quiet">
          ← Back to the grid
        </Link>
        <span className="text-mute">
          Entry {entry.position} of {entry.count} in your order
        </span>
        {entry.prevId && (
          <Link to={`/judging/${c.id}/entries/${entry.prevId}`} className="btn-quiet">
            Previous
          </Link>
        )}
        {entry.nextId && (
          <Link to={`/judging/${c.id}/entries/${entry.nextId}`} className="btn-quiet">
            Next
          </Link>
        )}
      </nav>
      <p className="kicker text-violet">{c.title}</p>
      <h1 className="mt-1 text-display font-extrabold">{entry.title}</h1>
      <p className="mt-1 text-ink-soft">{entry.crew ? `by ${entry.crew}` : "Crew hidden: judging is blind until the results are out."}</p>
      {entry.description && <p className="mt-4 max-w-3xl whitespace-pre-line">{entry.description}</p>}
      {late && (
        <div className="card mt-4 border-violet" data-testid="jury-late-note">
          {late.exception && <LateExceptionNotice exception={late.exception} timeZone={c.timeZone} />}
          {late.judgedUploadLate && <p className="mt-1 text-sm">The upload you judge arrived after the deadline, under the organizer's late exception for this entry.</p>}
        </div>
      )}

      <div className="mt-6 grid gap-6 lg:grid-cols-[2fr_1fr]">
        <section aria-labelledby="capture-h" className="space-y-4">
          <h2 id="capture-h" className="text-lg font-bold">
            Reference capture
          </h2>
          <ScoringEntryMedia video={media.video} audio={media.audio} still={media.still} flash={flash} />
          {media.contactSheet && <img src={media.contactSheet.url} alt="Stills from the reference capture" className="w-full rounded border border-line" />}
          {media.layout && (
            <figure className="card">
              <img src={media.layout.url} alt="Layout picture of the entry's tile" className="mx-auto max-h-96" />
              <figcaption className="mt-2 text-sm text-mute">Layout of the tile, drawn by Gatecrash from the uploaded GDSII.</figcaption>
            </figure>
          )}
        </section>
        <aside className="space-y-4">
          <section className="card" aria-labelledby="check-h">
            <h2 id="check-h" className="font-bold">
              Conformance check
            </h2>
            {!check ? (
              <p className="mt-2 text-sm text-ink-soft">No check run yet for the counting upload.</p>
            ) : check.state !== "done" ? (
              <p className="mt-2 text-sm text-ink-soft">The check run of upload {check.uploadNumber} is {check.state}.</p>
            ) : (
              <>
                <p className="mt-2">
                  Upload {check.uploadNumber}:{" "}
                  <span className={`rounded-full px-2 py-0.5 text-xs font-bold uppercase ${VERDICT[check.verdict ?? ""] ?? "bg-line"}`}>{check.verdict ?? "no verdict"}</span>
                </p>
                <p className="mt-1 text-xs text-mute">{check.passCount} rules passed.</p>
                {check.findings.length > 0 && (
                  <ul className="mt-2 space-y-1 text-sm">
                    {check.findings.map((f) => (
                      <li key={f.rule}>
                        <span className={`mr-1 rounded px-1 text-xs font-bold uppercase ${VERDICT[f.verdict]}`}>{f.verdict}</span>
                        {f.title}
                        {f.measured && <span className="text-mute"> — {f.measured}{f.limit ? ` (limit ${f.limit})` : ""}</span>}
                      </li>
                    ))}
                  </ul>
                )}
                <p className="mt-2 text-xs text-mute">A passing check is not the foundry's signoff.</p>
              </>
            )}
          </section>
          {stats.map((s) => (
            <section key={s.label} className="card">
              <h2 className="font-bold">{s.label}</h2>
              <dl className="mt-2 grid grid-cols-2 gap-x-3 gap-y-1 text-sm">
                {s.rows.map((r) => (
                  <div key={r.label} className="contents">
                    <dt className="text-mute">{r.label}</dt>
                    <dd className="font-mono">{r.value}</dd>
                  </div>
                ))}
              </dl>
            </section>
          ))}
          <section className="card" aria-labelledby="conflict-h">
            <h2 id="conflict-h" className="font-bold">
              Declare a conflict
            </h2>
            <p className="mt-1 text-sm text-ink-soft">If you are too close to this entry to judge it fairly, say so: it leaves your grid and your scores on it stop counting.</p>
            <Form method="post" {...getFormProps(form)} className="mt-3">
              <label htmlFor={fields.reason.id} className="label">
                Reason
              </label>
              <textarea {...getTextareaProps(fields.reason)} rows={2} className="field" aria-describedby={fields.reason.errors ? `${fields.reason.id}-error` : undefined} />
              {fields.reason.errors && (
                <p id={`${fields.reason.id}-error`} className="field-error" role="alert">
                  {fields.reason.errors.join(" ")}
                </p>
              )}
              <button type="submit" className="btn-quiet mt-3">
                Declare conflict
              </button>
            </Form>
          </section>
        </aside>
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
