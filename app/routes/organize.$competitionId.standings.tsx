import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, useActionData } from "react-router";
import { StandingsChart } from "~/components/StandingsChart";
import { methodSchema } from "~/judging/forms";
import { requireJuryOrganizer } from "~/judging/http.server";
import { setJuryMethod } from "~/judging/jury.server";
import { standingsFor } from "~/judging/standings.server";
import type { Route } from "./+types/organize.$competitionId.standings";
import { readForm } from "~/api/body.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Standings · ${data?.competition.title ?? "Compo"} · Gatecrash` }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { c } = await requireJuryOrganizer(request, context, params.competitionId);
  const view = await standingsFor(c);
  return { competition: { id: c.id, title: c.title, eventTitle: c.eventTitle, locked: c.judgingLocked }, view };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, c } = await requireJuryOrganizer(request, context, params.competitionId);
  const s = parseWithZod(await readForm(request), { schema: methodSchema });
  if (s.status !== "success") return s.reply();
  if (s.value.juryMethod !== c.juryMethod) await setJuryMethod(c, s.value.juryMethod, user.id);
  return s.reply();
}

const f2 = (v: number | null | undefined) => (v === null || v === undefined ? "–" : v.toFixed(2));
const f3 = (v: number | null | undefined) => (v === null || v === undefined ? "–" : v.toFixed(3));

export default function Standings({ loaderData }: Route.ComponentProps) {
  const { competition: c, view } = loaderData;
  const lastResult = useActionData<typeof action>();
  const [form, fields] = useForm({ lastResult, onValidate: ({ formData }) => parseWithZod(formData, { schema: methodSchema }) });
  const title = new Map(view.entries.map((e) => [e.id, e]));
  const judgeName = new Map(view.judges.map((j) => [j.id, j.name]));
  const critName = new Map(view.criteria.map((cr) => [cr.id, cr.name]));
  const st = view.standings;
  const byEntry = new Map(st?.entries.map((e) => [e.candidate, e]) ?? []);
  const summaries = new Map(st?.judges.map((j) => [j.judge, j]) ?? []);
  const min = Math.min(...view.criteria.map((cr) => cr.scaleMin), 0);
  const max = Math.max(...view.criteria.map((cr) => cr.scaleMax), 1);
  const figureLabel = view.method === "jury-z" ? "z-score" : "raw";
  return (
    <div data-testid="standings" className="space-y-8">
      <header>
        <p className="kicker">
          <Link to="/organize" className="hover:underline">
            Organizer
          </Link>{" "}
          · {c.eventTitle}
        </p>
        <h1 className="mt-1 text-display font-extrabold">Jury standings: {c.title}</h1>
        <p className="mt-2 text-sm text-ink-soft">
          Computed live from the scores of the assigned judges{c.locked ? " (judging is closed: scores are locked)" : " — reload to see new scores"}.
          {view.excludedConflicted > 0 && ` ${view.excludedConflicted} score(s) left out because their judge has a conflict with the entry.`}
        </p>
      </header>

      <Form method="post" {...getFormProps(form)} className="card flex flex-wrap items-end gap-4">
        <fieldset>
          <legend className="label">Counting method</legend>
          <label className="mr-6 inline-flex items-center gap-2 text-sm">
            <input type="radio" name={fields.juryMethod.name} value="jury-z" defaultChecked={view.method === "jury-z"} /> Normalised per judge (z-scores)
          </label>
          <label className="inline-flex items-center gap-2 text-sm">
            <input type="radio" name={fields.juryMethod.name} value="jury-raw" defaultChecked={view.method === "jury-raw"} /> Raw means
          </label>
          {fields.juryMethod.errors && <p className="field-error">{fields.juryMethod.errors.join(" ")}</p>}
        </fieldset>
        <button type="submit" className="btn-primary">
          Use this method
        </button>
      </Form>

      {view.problem && (
        <div role="alert" className="rounded-md border border-fail bg-fail-soft px-3 py-2 text-sm text-fail">
          <p className="font-semibold">The scores cannot be counted as they are:</p>
          <ul className="ml-5 list-disc">
            {view.problem.map((p) => (
              <li key={p}>{p}</li>
            ))}
          </ul>
        </div>
      )}

      {st && (
        <>
          <section aria-labelledby="rank-h">
            <h2 id="rank-h" className="mb-2 text-xl font-bold">
              Ranking ({view.method === "jury-z" ? "normalised" : "raw"})
            </h2>
            <div className="overflow-x-auto rounded-xl border border-line bg-card">
              <table className="w-full text-sm" data-testid="ranking">
                <thead className="bg-paper text-left text-ink-soft">
                  <tr>
                    <th className="px-3 py-2">Place</th>
                    <th className="px-3 py-2">Entry</th>
                    <th className="px-3 py-2 text-right">Score</th>
                    <th className="px-3 py-2 text-right">Raw mean</th>
                    <th className="px-3 py-2 text-right">Normalised</th>
                    <th className="px-3 py-2 text-right">Median ({figureLabel})</th>
                    <th className="px-3 py-2 text-right">Top-three placements</th>
                    <th className="px-3 py-2">Tie</th>
                  </tr>
                </thead>
                <tbody>
                  {st.ranking.map((r) => {
                    const e = byEntry.get(r.candidate);
                    return (
                      <tr key={r.candidate} className="border-t border-line" data-testid={`rank-${r.candidate}`}>
                        <td className="px-3 py-2 font-bold">{r.place}</td>
                        <td className="px-3 py-2">
                          <span className="font-semibold">{title.get(r.candidate)?.title}</span>{" "}
                          <span className="text-mute">by {title.get(r.candidate)?.crew}</span>
                          <Link to={`/organize/${c.id}/entries/${r.candidate}/history`} className="ml-2 text-xs text-signal underline">
                            history
                          </Link>
                        </td>
                        <td className="px-3 py-2 text-right font-mono" data-testid="score">
                          {f3(r.score)}
                        </td>
                        <td className="px-3 py-2 text-right font-mono">{f3(e?.raw)}</td>
                        <td className="px-3 py-2 text-right font-mono">{f3(e?.normalised)}</td>
                        <td className="px-3 py-2 text-right font-mono">{f3(e?.median)}</td>
                        <td className="px-3 py-2 text-right font-mono">{e?.topThree ?? 0}</td>
                        <td className="px-3 py-2 text-xs">{r.tied ? "shared place" : r.decidedBy && r.decidedBy !== "score" ? `decided by ${r.decidedBy}` : ""}</td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
          </section>

          <section aria-labelledby="judges-h" className="grid gap-6 lg:grid-cols-[1fr_2fr]">
            <div>
              <h2 id="judges-h" className="mb-2 text-xl font-bold">
                Judges
              </h2>
              <table className="w-full rounded-xl border border-line bg-card text-sm" data-testid="judge-summary">
                <thead className="bg-paper text-left text-ink-soft">
                  <tr>
                    <th className="px-3 py-2">Judge</th>
                    <th className="px-3 py-2 text-right">Scores</th>
                    <th className="px-3 py-2 text-right">Mean</th>
                    <th className="px-3 py-2 text-right">SD</th>
                  </tr>
                </thead>
                <tbody>
                  {view.judges.map((j) => {
                    const s = summaries.get(j.id);
                    return (
                      <tr key={j.id} className="border-t border-line">
                        <td className="px-3 py-2 font-medium">{j.name}</td>
                        <td className="px-3 py-2 text-right font-mono">{s?.count ?? 0}</td>
                        <td className="px-3 py-2 text-right font-mono">{f2(s?.mean)}</td>
                        <td className="px-3 py-2 text-right font-mono">
                          {f2(s?.sd)}
                          {s && s.spread !== "ok" && <span className="block text-xs text-warn">{s.spread === "single-score" ? "single score: z = 0" : "no spread: z = 0"}</span>}
                        </td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
            <div>
              <h2 className="mb-2 text-xl font-bold">Score distribution</h2>
              <StandingsChart
                min={min}
                max={max}
                judges={view.judges.map((j) => ({
                  id: j.id,
                  name: j.name,
                  values: view.scores.filter((s) => s.judge === j.id).map((s) => s.value),
                  mean: summaries.get(j.id)?.mean ?? null,
                  sd: summaries.get(j.id)?.sd ?? null,
                }))}
              />
            </div>
          </section>

          <section aria-labelledby="per-judge-h">
            <h2 id="per-judge-h" className="mb-2 text-xl font-bold">
              Per entry and judge: weighted raw / normalised (place for that judge)
            </h2>
            <div className="overflow-x-auto rounded-xl border border-line bg-card">
              <table className="w-full text-sm" data-testid="per-judge">
                <thead className="bg-paper text-left text-ink-soft">
                  <tr>
                    <th className="px-3 py-2">Entry</th>
                    {view.judges.map((j) => (
                      <th key={j.id} className="px-3 py-2 text-right">
                        {j.name}
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {st.ranking.map((r) => (
                    <tr key={r.candidate} className="border-t border-line">
                      <td className="px-3 py-2 font-medium">{title.get(r.candidate)?.title}</td>
                      {view.judges.map((j) => {
                        const pj = byEntry.get(r.candidate)?.perJudge.find((p) => p.judge === j.id);
                        return (
                          <td key={j.id} className="px-3 py-2 text-right font-mono">
                            {pj ? (
                              <>
                                {f2(pj.raw)} / {f3(pj.normalised)} <span className="text-mute">({pj.placeForJudge})</span>
                              </>
                            ) : (
                              <span className="text-mute">not scored</span>
                            )}
                          </td>
                        );
                      })}
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </section>

          <section aria-labelledby="missing-h">
            <h2 id="missing-h" className="mb-2 text-xl font-bold">
              Missing scores
            </h2>
            {view.judges.some((j) => !summaries.has(j.id)) && (
              <p className="mb-2 text-sm" data-testid="idle-judges">
                <strong>No scores yet from:</strong> {view.judges.filter((j) => !summaries.has(j.id)).map((j) => j.name).join(", ")} — they are left out of
                every mean until they score.
              </p>
            )}
            {st.missing.length === 0 ? (
              <p className="text-sm text-mute">None: every judge scored every criterion of every entry.</p>
            ) : (
              <ul className="space-y-1 text-sm" data-testid="missing">
                {st.missing.map((m, i) => (
                  <li key={i}>
                    {m.kind === "unscored" ? (
                      <strong>{title.get(m.candidate)?.title}: nobody scored it</strong>
                    ) : m.kind === "entry" ? (
                      <strong>
                        {judgeName.get(m.judge)} did not score {title.get(m.candidate)?.title}
                      </strong>
                    ) : (
                      <strong>
                        {judgeName.get(m.judge)} gave no {critName.get(m.criterion)} score to {title.get(m.candidate)?.title}
                      </strong>
                    )}{" "}
                    — <span className="text-ink-soft">{m.treatment}</span>
                  </li>
                ))}
              </ul>
            )}
          </section>

          <section aria-labelledby="rules-h" className="card">
            <h2 id="rules-h" className="font-bold">
              How this is counted
            </h2>
            <ul className="ml-5 mt-2 list-disc space-y-1 text-sm text-ink-soft">
              {st.rules.map((r) => (
                <li key={r}>{r}</li>
              ))}
              <li>Criteria weights: {view.criteria.map((cr) => `${cr.name} ${cr.weight}`).join(", ")}.</li>
            </ul>
          </section>
        </>
      )}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
