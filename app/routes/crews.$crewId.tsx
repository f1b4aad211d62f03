import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useActionData, useNavigation } from "react-router";
import { z } from "zod";
import { requireUser } from "~/auth/guards.server";
import type { RequestContext } from "~/auth/guards.server";
import { FormErrors, FormField } from "~/components/FormField";
import { inviteFormSchema } from "~/crews/rules";
import { crewForMember, inviteToCrew, leaveCrew, makeCaptain } from "~/crews/service.server";
import type { Route } from "./+types/crews.$crewId";
import { readForm } from "~/api/body.server";
import { isId } from "~/security/ids";
import { attempt, formReply } from "~/errors/http.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.crew.name ?? "Crew"} · Gatecrash` }];

async function load(request: Request, context: RequestContext, crewId: string) {
  const user = await requireUser(request, context);
  const view = isId(crewId) ? await crewForMember(crewId, user.id) : null;
  if (!view) throw data({ message: "This crew does not exist, or you are not in it." }, { status: 404 });
  return { user, view };
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { user, view } = await load(request, context, params.crewId);
  return {
    me: user.id,
    crew: { id: view.crew.id, name: view.crew.name, handle: view.crew.handle },
    myRole: view.myRole,
    members: view.members.map((m) => ({ ...m, joinedAt: m.joinedAt.toISOString() })),
    invites: view.invites.map((i) => ({ id: i.id, email: i.email, expiresAt: i.expiresAt.toISOString() })),
    entries: view.entries,
  };
}

/** Every form of this page in one schema, told apart by `intent`. */
const actionSchema = z.discriminatedUnion("intent", [inviteFormSchema, z.object({ intent: z.literal("leave") }), z.object({ intent: z.literal("captain"), memberId: z.string().min(1) })]);

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, view } = await load(request, context, params.crewId);
  const submission = parseWithZod(await readForm(request), { schema: actionSchema });
  if (submission.status !== "success") {
    if (submission.payload.intent === "invite") return { invite: submission.reply(), notice: null };
    throw data({ message: "Unknown action." }, { status: 400 });
  }
  const v = submission.value;
  if (v.intent === "invite") {
    if (view.myRole !== "captain") return { invite: submission.reply({ formErrors: ["Only a captain can invite."] }), notice: null };
    const out = await attempt(() => inviteToCrew(view.crew.id, user, v.email));
    if (!out.ok) return { invite: formReply(submission, out.error), notice: null };
    return { invite: submission.reply({ resetForm: true }), notice: `Invitation sent to ${v.email}.` };
  }
  if (v.intent === "leave") {
    const out = await attempt(() => leaveCrew(view.crew.id, user.id));
    if (!out.ok) return { invite: null, notice: out.error.message };
    return redirect("/my/entries");
  }
  const out = await attempt(() => makeCaptain(view.crew.id, user.id, v.memberId));
  return { invite: null, notice: out.ok ? "Captaincy shared." : out.error.message };
}

export default function CrewPage({ loaderData }: Route.ComponentProps) {
  const { crew, members, invites, entries, myRole } = loaderData;
  const result = useActionData<typeof action>();
  const nav = useNavigation();
  const [form, fields] = useForm({ id: "invite", lastResult: result?.invite, shouldValidate: "onBlur", onValidate: ({ formData }) => parseWithZod(formData, { schema: inviteFormSchema }) });
  return (
    <div className="grid gap-6 md:grid-cols-[2fr_1fr]">
      <section>
        <p className="kicker">Crew · @{crew.handle}</p>
        <h1 className="mb-6 mt-1 text-display font-extrabold">{crew.name}</h1>
        {result?.notice && (
          <p role="status" className="mb-4 rounded-md border border-line bg-card px-3 py-2 text-sm font-medium">
            {result.notice}
          </p>
        )}
        <h2 className="mb-2 text-lg font-bold">Members</h2>
        <ul className="card mb-6 divide-y divide-line p-0">
          {members.map((m) => (
            <li key={m.userId} className="flex items-center justify-between gap-2 px-5 py-3">
              <span>
                <span className="font-semibold">{m.name}</span> <span className="text-sm text-mute">{m.email}</span>
              </span>
              <span className="flex items-center gap-2">
                <span className={`rounded-full px-2 py-0.5 text-xs font-semibold ${m.role === "captain" ? "bg-signal-soft text-signal" : "bg-line text-ink-soft"}`}>{m.role}</span>
                {myRole === "captain" && m.role !== "captain" && (
                  <Form method="post">
                    <input type="hidden" name="intent" value="captain" />
                    <input type="hidden" name="memberId" value={m.userId} />
                    <button className="btn-quiet py-1 text-xs" type="submit">Make captain</button>
                  </Form>
                )}
              </span>
            </li>
          ))}
        </ul>
        <h2 className="mb-2 text-lg font-bold">Entries</h2>
        {entries.length === 0 ? (
          <p className="mb-6 text-mute">
            No entries yet. <Link to="/my/entries" className="font-semibold text-signal">Find an open compo</Link>.
          </p>
        ) : (
          <ul className="mb-6 grid gap-2">
            {entries.map((e) => (
              <li key={e.id}>
                <Link to={`/entries/${e.id}`} className="card block py-3 hover:border-ink-soft">
                  <span className="font-semibold">{e.title}</span> <span className="text-sm text-mute">{e.event} · {e.competition}</span>
                </Link>
              </li>
            ))}
          </ul>
        )}
        <Form method="post">
          <input type="hidden" name="intent" value="leave" />
          <button className="btn-quiet" type="submit">Leave this crew</button>
        </Form>
        <p className="mt-2 text-xs text-mute">
          The last captain hands over the captaincy before leaving. The only member of a crew without entries may leave; the crew is then deleted.
        </p>
      </section>
      <aside>
        {myRole === "captain" && (
          <Form method="post" {...getFormProps(form)} className="card">
            <h2 className="mb-3 text-lg font-bold">Invite a member</h2>
            <input type="hidden" name="intent" value="invite" />
            <FormErrors errors={form.errors} />
            <FormField field={fields.email} label="E-mail" type="email" hint="We send a link that works for 7 days." />
            <button className="btn-primary" type="submit" disabled={nav.state !== "idle"}>Send invitation</button>
          </Form>
        )}
        {invites.length > 0 && (
          <div className="card mt-4">
            <h2 className="mb-2 text-sm font-bold">Open invitations</h2>
            <ul className="text-sm">
              {invites.map((i) => (
                <li key={i.id}>
                  {i.email} <span className="text-mute">until {new Date(i.expiresAt).toISOString().slice(0, 10)}</span>
                </li>
              ))}
            </ul>
          </div>
        )}
      </aside>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
