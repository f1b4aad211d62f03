import { getFormProps, getSelectProps, getTextareaProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useActionData, useNavigation } from "react-router";
import { requireUser } from "~/auth/guards.server";
import type { RequestContext } from "~/auth/guards.server";
import { formatInZone } from "~/competitions/timezone";
import { FormErrors, FormField } from "~/components/FormField";
import { crewsOf } from "~/crews/service.server";
import { cutoffOf } from "~/entries/deadline";
import { entryFormSchema } from "~/entries/forms";
import { competitionBySlugs, createEntry, entriesOfCrewsOf } from "~/entries/service.server";
import { formatMoney } from "~/payments/states";
import type { Route } from "./+types/e.$eventSlug.$competitionSlug.enter";
import { readForm } from "~/api/body.server";
import { attempt, formReply } from "~/errors/http.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Enter ${data?.competition.title ?? "a compo"} · Gatecrash` }];

async function load(request: Request, context: RequestContext, params: { eventSlug: string; competitionSlug: string }) {
  const user = await requireUser(request, context);
  const row = await competitionBySlugs(params.eventSlug, params.competitionSlug);
  if (!row) throw data({ message: "This competition does not exist or is not public." }, { status: 404 });
  return { user, ...row };
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { user, competition, event } = await load(request, context, params);
  const crews = await crewsOf(user.id);
  const taken = await entriesOfCrewsOf(crews.map((c) => c.id));
  const cutoff = cutoffOf(competition.deadlineAt, competition.graceMinutes);
  return {
    competition: { id: competition.id, title: competition.title, state: competition.state, fee: competition.feeAmount > 0 ? formatMoney(competition.feeAmount, competition.feeCurrency) : null },
    event: { title: event.title, timeZone: event.timeZone },
    deadline: cutoff ? formatInZone(cutoff.toISOString(), event.timeZone) : null,
    open: competition.state === "open" && (!cutoff || cutoff > new Date()),
    crews: crews.map((c) => ({ ...c, entryId: taken.find((t) => t.crewId === c.id && t.competitionId === competition.id)?.id ?? null })),
    here: new URL(request.url).pathname,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, competition } = await load(request, context, params);
  const submission = parseWithZod(await readForm(request), { schema: entryFormSchema });
  if (submission.status !== "success") return submission.reply();
  const out = await attempt(() => createEntry(user, competition.id, submission.value));
  if (!out.ok) return formReply(submission, out.error);
  return redirect(`/entries/${out.value.entryId}`);
}

export default function Enter({ loaderData }: Route.ComponentProps) {
  const { competition, event, crews, open, deadline, here } = loaderData;
  const lastResult = useActionData<typeof action>();
  const nav = useNavigation();
  const free = crews.filter((c) => !c.entryId);
  const [form, fields] = useForm({
    lastResult,
    defaultValue: { crewId: free[0]?.id },
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: entryFormSchema }),
  });
  return (
    <div className="mx-auto max-w-xl">
      <p className="kicker">{event.title}</p>
      <h1 className="mb-2 mt-1 text-display font-extrabold">Enter {competition.title}</h1>
      <p className="mb-6 text-ink-soft">
        {deadline ? <>Deadline {deadline}. </> : null}
        {competition.fee ? <>Entry fee {competition.fee}, paid on the entry page.</> : <>No entry fee.</>}
      </p>
      {crews.filter((c) => c.entryId).map((c) => (
        <p key={c.id} className="card mb-4 py-3">
          {c.name} already entered: <Link className="font-semibold text-signal" to={`/entries/${c.entryId}`}>open its entry</Link>.
        </p>
      ))}
      {!open ? (
        <p role="alert" className="card text-ink-soft">This competition is not open for entries.</p>
      ) : crews.length === 0 ? (
        <div className="card">
          <p className="mb-4">You enter as a crew, even alone. Start one first; you come back here afterwards.</p>
          <Link to={`/crews/new?next=${encodeURIComponent(here)}`} className="btn-primary">Start a crew</Link>
        </div>
      ) : free.length === 0 ? null : (
        <Form method="post" {...getFormProps(form)} className="card">
          <FormErrors errors={form.errors} />
          <div className="mb-4">
            <label htmlFor={fields.crewId.id} className="label">Crew</label>
            <select {...getSelectProps(fields.crewId)} className="field" aria-describedby={fields.crewId.errors ? `${fields.crewId.id}-error` : undefined}>
              {free.map((c) => (
                <option key={c.id} value={c.id}>{c.name} (@{c.handle})</option>
              ))}
            </select>
            {fields.crewId.errors && <p id={`${fields.crewId.id}-error`} className="field-error" role="alert">{fields.crewId.errors.join(" ")}</p>}
          </div>
          <FormField field={fields.title} label="Entry title" />
          <div className="mb-4">
            <label htmlFor={fields.description.id} className="label">Description</label>
            <textarea {...getTextareaProps(fields.description)} rows={4} className="field" aria-describedby={fields.description.errors ? `${fields.description.id}-error` : undefined} />
            {fields.description.errors && <p id={`${fields.description.id}-error`} className="field-error" role="alert">{fields.description.errors.join(" ")}</p>}
          </div>
          <button type="submit" className="btn-primary" disabled={nav.state !== "idle"}>Create entry</button>
        </Form>
      )}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
