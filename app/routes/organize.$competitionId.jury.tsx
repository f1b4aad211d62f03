import { getFormProps, getInputProps, getSelectProps, getTextareaProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useActionData } from "react-router";
import { z } from "zod";
import { FormErrors } from "~/components/FormField";
import { StateBadge } from "~/components/StateBadge";
import { env } from "~/env.server";
import { inviteSchema, lockSchema, optionsSchema, organizerConflictSchema } from "~/judging/forms";
import { attempt, formReply, pageCall } from "~/errors/http.server";
import { requireJuryOrganizer } from "~/judging/http.server";
import { declareConflict, inviteJudge, juryOverview, removeConflict, revokeInvite, setAssignment, setJudgingLocked, setJudgingOptions } from "~/judging/jury.server";
import type { Route } from "./+types/organize.$competitionId.jury";
import { readForm } from "~/api/body.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Jury · ${data?.competition.title ?? "Compo"} · Gatecrash` }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { c } = await requireJuryOrganizer(request, context, params.competitionId);
  return {
    competition: { id: c.id, title: c.title, state: c.state, eventTitle: c.eventTitle, blindJudging: c.blindJudging, orderMode: c.orderMode, locked: c.judgingLocked },
    jury: await juryOverview(c),
  };
}

const assignSchema = z.object({ intent: z.literal("assign"), judgeUserId: z.string().min(1), assigned: z.enum(["true", "false"]) });
const idSchema = (intent: "revoke" | "remove-conflict") => z.object({ intent: z.literal(intent), id: z.string().min(1) });
/** Every form of this page in one schema, told apart by `intent`. */
const actionSchema = z.discriminatedUnion("intent", [inviteSchema, organizerConflictSchema, optionsSchema, lockSchema, assignSchema, idSchema("revoke"), idSchema("remove-conflict")]);
/** The forms that show their own field errors; the others are buttons, whose bad request is a 400. */
const FORM_INTENTS = ["invite", "conflict", "options", "lock"] as const;
type FormIntent = (typeof FORM_INTENTS)[number];
const isFormIntent = (v: string): v is FormIntent => (FORM_INTENTS as readonly string[]).includes(v);

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, c } = await requireJuryOrganizer(request, context, params.competitionId);
  const form = await readForm(request);
  const s = parseWithZod(form, { schema: actionSchema });
  if (s.status !== "success") {
    const intent = String(form.get("intent") ?? "");
    if (isFormIntent(intent)) return { intent, result: s.reply() };
    if (intent === "assign") throw data({ message: "That assignment request is not valid." }, { status: 400 });
    if (intent === "revoke" || intent === "remove-conflict") throw data({ message: "That request is not valid." }, { status: 400 });
    throw data({ message: "Unknown action." }, { status: 400 });
  }
  const v = s.value;
  switch (v.intent) {
    case "invite": {
      const out = await attempt(() => inviteJudge({ competition: c, email: v.email, invitedBy: user.id, appUrl: env().APP_URL }));
      if (!out.ok) return { intent: v.intent, result: formReply(s, out.error) };
      return { intent: v.intent, result: s.reply({ resetForm: true }), notice: `Invitation sent to ${v.email}.` };
    }
    case "conflict":
      await pageCall(() => declareConflict(c, { entryId: v.entryId, judgeUserId: v.judgeUserId, reason: v.reason, declaredBy: user.id }));
      return { intent: v.intent, result: s.reply({ resetForm: true }), notice: "Conflict recorded." };
    case "options":
      await setJudgingOptions(c, { blindJudging: v.blindJudging, orderMode: v.orderMode }, user.id);
      return { intent: v.intent, result: s.reply(), notice: "Judging options saved." };
    case "lock":
      await setJudgingLocked(c, v.locked === "true", user.id, v.reason ?? "");
      return { intent: v.intent, result: s.reply(), notice: v.locked === "true" ? "Judging closed: scores are locked." : "Judging reopened (logged)." };
    case "assign":
      await pageCall(() => setAssignment(c, v.judgeUserId, v.assigned === "true", user.id));
      return { intent: v.intent, notice: v.assigned === "true" ? "Judge assigned." : "Judge taken off this jury." };
    case "revoke":
      await pageCall(() => revokeInvite(c, v.id, user.id));
      return { intent: v.intent, notice: "Invitation withdrawn." };
    case "remove-conflict":
      await pageCall(() => removeConflict(c, v.id, user.id));
      return { intent: v.intent, notice: "Conflict withdrawn." };
  }
}

export default function OrganizeJury({ loaderData }: Route.ComponentProps) {
  const { competition: c, jury } = loaderData;
  const actionData = useActionData<typeof action>();
  const resultFor = (intent: string) => (actionData?.intent === intent && "result" in actionData ? actionData.result : undefined);
  const [inviteForm, inviteFields] = useForm({ id: "invite", lastResult: resultFor("invite"), shouldValidate: "onBlur", onValidate: ({ formData }) => parseWithZod(formData, { schema: inviteSchema }) });
  const [conflictForm, conflictFields] = useForm({
    id: "conflict",
    lastResult: resultFor("conflict"),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: organizerConflictSchema }),
  });
  const judges = jury.judges;
  return (
    <div data-testid="organize-jury" className="space-y-8">
      <header>
        <p className="kicker">
          <Link to="/organize" className="hover:underline">
            Organizer
          </Link>{" "}
          · {c.eventTitle}
        </p>
        <div className="mt-1 flex flex-wrap items-center gap-3">
          <h1 className="text-display font-extrabold">Jury of {c.title}</h1>
          <StateBadge state={c.state} />
        </div>
        {actionData?.notice && (
          <p role="status" className="mt-4 rounded-md border border-pass bg-pass-soft px-3 py-2 text-sm font-medium text-pass">
            {actionData.notice}
          </p>
        )}
      </header>

      <section className="card" aria-labelledby="lock-h">
        <h2 id="lock-h" className="text-lg font-bold">
          Judging is {c.locked ? "closed" : "open"}
        </h2>
        <p className="mt-1 text-sm text-ink-soft">
          {c.locked
            ? "Scores are locked: every change is refused. Reopening is logged with your name and reason."
            : "Judges can score and change scores. Close judging to lock every score before publishing results."}
        </p>
        <Form method="post" className="mt-3 flex flex-wrap items-end gap-3">
          <input type="hidden" name="intent" value="lock" />
          <input type="hidden" name="locked" value={c.locked ? "false" : "true"} />
          <div className="min-w-64 flex-1">
            <label htmlFor="lock-reason" className="label">
              Reason (kept in the log)
            </label>
            <input id="lock-reason" name="reason" className="field" maxLength={300} placeholder={c.locked ? "e.g. a judge's scores were entered on the wrong entry" : "e.g. all scores in"} />
          </div>
          <button type="submit" className={c.locked ? "btn-quiet" : "btn-signal"}>
            {c.locked ? "Reopen judging" : "Close judging"}
          </button>
        </Form>
      </section>

      <section className="card" aria-labelledby="judges-h">
        <h2 id="judges-h" className="text-lg font-bold">
          Judges of the event
        </h2>
        {judges.length === 0 ? (
          <p className="mt-2 text-sm text-ink-soft">No judges yet. Invite them below.</p>
        ) : (
          <table className="mt-3 w-full text-sm">
            <thead>
              <tr className="text-left text-ink-soft">
                <th className="py-1">Judge</th>
                <th className="py-1">E-mail</th>
                <th className="py-1">On this jury</th>
              </tr>
            </thead>
            <tbody>
              {judges.map((j) => (
                <tr key={j.id} className="border-t border-line" data-testid={`judge-row-${j.email}`}>
                  <td className="py-2 font-medium">{j.name}</td>
                  <td className="py-2 text-mute">{j.email}</td>
                  <td className="py-2">
                    <Form method="post">
                      <input type="hidden" name="intent" value="assign" />
                      <input type="hidden" name="judgeUserId" value={j.id} />
                      <input type="hidden" name="assigned" value={j.assigned ? "false" : "true"} />
                      <span className="mr-3">{j.assigned ? "Assigned" : "Not assigned"}</span>
                      <button type="submit" className="btn-quiet px-2 py-1" aria-label={`${j.assigned ? "Take off" : "Assign"} ${j.name}`}>
                        {j.assigned ? "Take off" : "Assign"}
                      </button>
                    </Form>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}

        <Form method="post" {...getFormProps(inviteForm)} className="mt-6 flex flex-wrap items-start gap-3">
          <input type="hidden" name="intent" value="invite" />
          <div className="min-w-64 flex-1">
            <label htmlFor={inviteFields.email.id} className="label">
              Invite a judge by e-mail
            </label>
            <input {...getInputProps(inviteFields.email, { type: "email" })} className="field" aria-describedby={inviteFields.email.errors ? `${inviteFields.email.id}-error` : undefined} />
            {inviteFields.email.errors && (
              <p id={`${inviteFields.email.id}-error`} className="field-error" role="alert">
                {inviteFields.email.errors.join(" ")}
              </p>
            )}
          </div>
          <button type="submit" className="btn-primary mt-6">
            Send invitation
          </button>
        </Form>
        {jury.invites.length > 0 && (
          <ul className="mt-4 space-y-1 text-sm">
            {jury.invites.map((i) => (
              <li key={i.id} className="flex items-center gap-3">
                <span className="font-medium">{i.email}</span>
                <span className="text-mute">{i.acceptedAt ? "accepted" : i.expired ? "expired" : `open until ${i.expiresAt.slice(0, 10)}`}</span>
                {!i.acceptedAt && (
                  <Form method="post">
                    <input type="hidden" name="intent" value="revoke" />
                    <input type="hidden" name="id" value={i.id} />
                    <button type="submit" className="text-xs font-semibold text-signal underline" aria-label={`Withdraw the invitation to ${i.email}`}>
                      Withdraw
                    </button>
                  </Form>
                )}
              </li>
            ))}
          </ul>
        )}
      </section>

      <section className="card" aria-labelledby="options-h">
        <h2 id="options-h" className="text-lg font-bold">
          How entries are presented
        </h2>
        <Form method="post" className="mt-3 space-y-3">
          <input type="hidden" name="intent" value="options" />
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" name="blindJudging" defaultChecked={c.blindJudging} /> Blind judging: hide crew names from judges until the results are out
          </label>
          <fieldset>
            <legend className="label">Presentation order</legend>
            <label className="mr-6 inline-flex items-center gap-2 text-sm">
              <input type="radio" name="orderMode" value="shared" defaultChecked={c.orderMode !== "per-judge"} /> One shared random order for the whole jury
            </label>
            <label className="inline-flex items-center gap-2 text-sm">
              <input type="radio" name="orderMode" value="per-judge" defaultChecked={c.orderMode === "per-judge"} /> A separate random order per judge
            </label>
          </fieldset>
          <p className="text-xs text-mute">Orders are seeded and stored: they never change under a judge; an entry joining or leaving does not reorder the others.</p>
          <button type="submit" className="btn-quiet">
            Save options
          </button>
        </Form>
      </section>

      <section className="card" aria-labelledby="conflicts-h">
        <h2 id="conflicts-h" className="text-lg font-bold">
          Conflicts
        </h2>
        <p className="mt-1 text-sm text-ink-soft">A conflicted judge never sees the entry on their grid and cannot score it. Crew membership is a conflict by itself.</p>
        {jury.conflicts.length === 0 ? (
          <p className="mt-2 text-sm text-mute">No conflicts.</p>
        ) : (
          <ul className="mt-3 space-y-1 text-sm" data-testid="conflict-list">
            {jury.conflicts.map((x) => (
              <li key={`${x.judgeId}:${x.entryId}`} className="flex flex-wrap items-center gap-2">
                <strong>{x.judgeName}</strong> — {x.entryTitle}: <span className="text-ink-soft">{x.reason}</span>
                <span className="rounded bg-line px-1.5 text-xs">{x.kind === "crew" ? "automatic" : "declared"}</span>
                {x.id && (
                  <Form method="post">
                    <input type="hidden" name="intent" value="remove-conflict" />
                    <input type="hidden" name="id" value={x.id} />
                    <button type="submit" className="text-xs font-semibold text-signal underline">
                      Withdraw
                    </button>
                  </Form>
                )}
              </li>
            ))}
          </ul>
        )}
        <Form method="post" {...getFormProps(conflictForm)} className="mt-4 grid gap-3 md:grid-cols-3">
          <input type="hidden" name="intent" value="conflict" />
          <FormErrors errors={conflictForm.errors} />
          <div>
            <label htmlFor={conflictFields.judgeUserId.id} className="label">
              Judge
            </label>
            <select {...getSelectProps(conflictFields.judgeUserId)} className="field">
              <option value="">Choose…</option>
              {judges.map((j) => (
                <option key={j.id} value={j.id}>
                  {j.name}
                </option>
              ))}
            </select>
            {conflictFields.judgeUserId.errors && <p className="field-error">{conflictFields.judgeUserId.errors.join(" ")}</p>}
          </div>
          <div>
            <label htmlFor={conflictFields.entryId.id} className="label">
              Entry
            </label>
            <select {...getSelectProps(conflictFields.entryId)} className="field">
              <option value="">Choose…</option>
              {jury.entries.map((e) => (
                <option key={e.id} value={e.id}>
                  {e.title} ({e.crew})
                </option>
              ))}
            </select>
            {conflictFields.entryId.errors && <p className="field-error">{conflictFields.entryId.errors.join(" ")}</p>}
          </div>
          <div>
            <label htmlFor={conflictFields.reason.id} className="label">
              Reason
            </label>
            <textarea {...getTextareaProps(conflictFields.reason)} rows={1} className="field" />
            {conflictFields.reason.errors && <p className="field-error">{conflictFields.reason.errors.join(" ")}</p>}
          </div>
          <div className="md:col-span-3">
            <button type="submit" className="btn-quiet">
              Record conflict
            </button>
          </div>
        </Form>
      </section>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
