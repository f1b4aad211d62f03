import { getFormProps, getInputProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, useNavigation } from "react-router";
import { audit } from "~/audit/log.server";
import { readForm } from "~/api/body.server";
import { requireEventRole } from "~/competitions/access.server";
import { FormErrors } from "~/components/FormField";
import { partyFormSchema, partyCodesSchema } from "~/party/forms";
import { awardCandidates, awardsOfEvent, createAward, deleteAward, updateAward } from "~/results/awards.server";
import { issueVoteCodes, partyCodes, unused, votableCompos } from "~/voting/code-book.server";
import { attempt, formReply } from "~/errors/http.server";
import type { Route } from "./+types/organize.events.$eventId.party";

/** The organizer's party desk: party-wide vote codes, awards, and the after-party archive and shuttle export. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { event } = await requireEventRole(request, context, params.eventId, "organizer");
  const codes = await partyCodes(event.id);
  return {
    event: { id: event.id, slug: event.slug, title: event.title },
    compos: (await votableCompos(event.id)).map((c) => ({ id: c.id, title: c.title, hasVote: Boolean(c.votingOpensAt && c.votingClosesAt) })),
    codes: { total: codes.length, unused: codes.filter(unused).length },
    awards: await awardsOfEvent(event.id),
    candidates: await awardCandidates(event.id),
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, event } = await requireEventRole(request, context, params.eventId, "organizer");
  const submission = parseWithZod(await readForm(request), { schema: partyFormSchema });
  if (submission.status !== "success") return { result: submission.reply(), done: null };
  const v = submission.value;
  const out = await attempt(async () => {
    if (v.intent === "codes") {
      const made = await issueVoteCodes({ eventId: event.id, competitionIds: v.compos, n: v.count, partyWide: true });
      await audit({ actorUserId: user.id, eventId: event.id, action: "vote-codes.generated", subjectType: "event", subjectId: event.id, details: { count: made.length, partyWide: true, competitionIds: v.compos } });
      return { reset: true, done: `${made.length} party-wide codes made.` };
    }
    if (v.intent === "award-delete") {
      await deleteAward(user.id, event.id, v.awardId);
      return { reset: false, done: "Award removed." };
    }
    const input = { title: v.title, citation: v.citation, winnerEntryId: v.winnerEntryId ?? null };
    if (v.intent === "award-add") await createAward(user.id, event.id, input);
    else if (v.awardId) await updateAward(user.id, event.id, v.awardId, input);
    return { reset: v.intent === "award-add", done: v.intent === "award-add" ? "Award added." : "Award saved." };
  });
  if (!out.ok) return { result: formReply(submission, out.error), done: null };
  return { result: submission.reply({ resetForm: out.value.reset }), done: out.value.done };
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Party desk · ${data?.event.title ?? "Event"} · Gatecrash` }];

export default function PartyDesk({ loaderData, actionData }: Route.ComponentProps) {
  const { event, compos, codes, awards, candidates } = loaderData;
  const nav = useNavigation();
  const busy = nav.state !== "idle";
  const last = nav.state === "idle" ? actionData?.result : undefined;
  const [form, fields] = useForm({ lastResult: last, onValidate: ({ formData }) => parseWithZod(formData, { schema: partyCodesSchema }), shouldValidate: "onSubmit" });
  const base = `/organize/events/${event.id}`;
  return (
    <div className="mx-auto max-w-4xl">
      <p className="kicker">
        <Link to={base}>{event.title}</Link> · Party desk
      </p>
      <h1 className="mb-2 mt-1 text-display font-extrabold">The party around the compos</h1>
      <p className="text-sm text-ink-soft">
        The public party page with its timetable: <Link className="font-semibold text-signal" to={`/e/${event.slug}`}>/e/{event.slug}</Link>
      </p>
      {actionData?.done && nav.state === "idle" && (
        <p role="status" className="mt-4 rounded-md bg-pass-soft px-3 py-2 text-sm font-medium text-pass">
          {actionData.done}
        </p>
      )}
      {actionData?.result?.error?.[""] && nav.state === "idle" && <FormErrors errors={actionData.result.error[""] ?? undefined} />}

      <section className="card mt-6" aria-labelledby="codes-h">
        <h2 id="codes-h" className="font-extrabold">Party-wide vote codes</h2>
        <p className="mt-1 text-sm text-ink-soft">
          One slip per visitor for every compo you tick: the code makes one ballot in each of them. Each compo's own codes stay on its audience page.
          {" "}{codes.total} party-wide codes so far, {codes.unused} unused.
        </p>
        <Form method="post" {...getFormProps(form)} className="mt-4 space-y-3">
          <input type="hidden" name="intent" value="codes" />
          <FormErrors errors={form.errors} />
          <fieldset>
            <legend className="label">The codes vote in</legend>
            <div className="mt-1 flex flex-wrap gap-4">
              {compos.map((c) => (
                <label key={c.id} className="flex items-center gap-2 text-sm">
                  <input type="checkbox" name={fields.compos.name} value={c.id} defaultChecked={c.hasVote} />
                  {c.title}
                  {!c.hasVote && <span className="text-xs text-mute">(no vote window yet)</span>}
                </label>
              ))}
            </div>
            {fields.compos.errors && <p className="field-error" role="alert">{fields.compos.errors.join(" ")}</p>}
          </fieldset>
          <div className="flex flex-wrap items-end gap-3">
            <div>
              <label htmlFor={fields.count.id} className="label">How many new codes</label>
              <input {...getInputProps(fields.count, { type: "number" })} min={1} max={500} className="field w-32" />
              {fields.count.errors && <p className="field-error" role="alert">{fields.count.errors.join(" ")}</p>}
            </div>
            <button type="submit" className="btn-primary" disabled={busy}>Generate party codes</button>
          </div>
        </Form>
        <div className="mt-4 flex flex-wrap gap-2">
          <a className="btn-quiet" href={`${base}/party/codes`} target="_blank" rel="noreferrer">Printable sheet of unused party codes</a>
          <a className="btn-quiet" href={`${base}/party/codes.csv`}>All party codes as CSV</a>
        </div>
      </section>

      <section className="card mt-6" aria-labelledby="awards-h">
        <h2 id="awards-h" className="font-extrabold">Awards</h2>
        <p className="mt-1 text-sm text-ink-soft">
          Special awards on top of the places: jury's choice, best sound, smallest design … An award shows on the results pages, the party sheet and the stage
          once its winner's compo has published results.
        </p>
        <ul className="mt-4 space-y-4" data-testid="awards-list">
          {awards.map((a) => (
            <li key={a.id} className="rounded-md border border-line p-3">
              <AwardForm intent="award-save" award={a} candidates={candidates} busy={busy} />
              <Form method="post" className="mt-2">
                <input type="hidden" name="intent" value="award-delete" />
                <input type="hidden" name="awardId" value={a.id} />
                <button type="submit" className="btn-quiet text-sm" disabled={busy}>Remove “{a.title}”</button>
              </Form>
              {a.winner && !a.winner.public && <p className="mt-1 text-xs text-mute">Not public yet: {a.winner.competitionTitle} has no published results.</p>}
            </li>
          ))}
        </ul>
        <h3 className="mt-6 font-bold">Add an award</h3>
        {/* A new key after each add empties the form. */}
        <AwardForm key={`add-${awards.length}`} intent="award-add" candidates={candidates} busy={busy} />
      </section>

      <section className="card mt-6" aria-labelledby="after-h">
        <h2 id="after-h" className="font-extrabold">After the party</h2>
        <ul className="mt-2 space-y-2 text-sm">
          <li>
            <a className="font-semibold text-signal" href={`${base}/archive.zip`} data-testid="archive-link">Download the party archive (.zip)</a>: every entry that was shown — source bundle, layout,
            capture, reference capture and an info file each — with SHA-256 sums in <code className="font-mono">SHA256SUMS</code> (check with <code className="font-mono">sha256sum -c SHA256SUMS</code>).
          </li>
          <li>
            <Link className="font-semibold text-signal" to={`${base}/shuttle`}>Export passing entries for the shuttle</Link>: you choose the entries; the zip holds their layouts and a manifest.
          </li>
        </ul>
      </section>
    </div>
  );
}

type Candidate = { id: string; title: string; crew: string; competitionTitle: string };

function AwardForm({ intent, award, candidates, busy }: { intent: "award-add" | "award-save"; award?: { id: string; title: string; citation: string; winner: { entryId: string } | null }; candidates: Candidate[]; busy: boolean }) {
  const id = award?.id ?? "new";
  return (
    <Form method="post" className="grid gap-2 sm:grid-cols-[1fr_1fr_auto] sm:items-end">
      <input type="hidden" name="intent" value={intent} />
      {award && <input type="hidden" name="awardId" value={award.id} />}
      <div>
        <label className="label" htmlFor={`award-title-${id}`}>Award</label>
        <input id={`award-title-${id}`} name="title" className="field w-full" defaultValue={award?.title} required maxLength={120} placeholder="Best sound" />
      </div>
      <div>
        <label className="label" htmlFor={`award-winner-${id}`}>Winner</label>
        <select id={`award-winner-${id}`} name="winnerEntryId" className="field w-full" defaultValue={award?.winner?.entryId ?? ""}>
          <option value="">— not decided —</option>
          {candidates.map((c) => (
            <option key={c.id} value={c.id}>
              {c.title} by {c.crew} ({c.competitionTitle})
            </option>
          ))}
        </select>
      </div>
      <button type="submit" className="btn-primary" disabled={busy}>{intent === "award-add" ? "Add award" : "Save"}</button>
      <div className="sm:col-span-3">
        <label className="label" htmlFor={`award-citation-${id}`}>Citation (optional)</label>
        <input id={`award-citation-${id}`} name="citation" className="field w-full" defaultValue={award?.citation} maxLength={600} placeholder="For a bass line that shook the hall" />
      </div>
    </Form>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
