import { data, Form, Link, redirect, useRevalidator } from "react-router";
import { requireUser } from "~/auth/guards.server";
import type { RequestContext } from "~/auth/guards.server";
import { CheckRunPanel } from "~/components/conformance/CheckRunPanel";
import { LatestCheckLine } from "~/components/conformance/LatestCheckLine";
import { useLiveCheck } from "~/components/conformance/useLiveCheck";
import { UploadCountdown } from "~/components/UploadCountdown";
import { UploadList } from "~/components/UploadList";
import { UploadPanel } from "~/components/UploadPanel";
import { latestCheckFor } from "~/conformance/report.server";
import { cutoffOf } from "~/entries/deadline";
import { acceptanceWindow } from "~/rules/monitor";
import { limitFor } from "~/entries/parts";
import { entryForViewer, rulesetOf, uploadsOfEntry } from "~/entries/service.server";
import { entryPageExtras, grantFromForm, parseEntryIntent, pickFinal, revokeFromForm } from "~/entries/entry-page.server";
import { LateExceptionCard } from "~/components/LateExceptionCard";
import { UploadCompare } from "~/components/UploadCompare";
import { FILE_KINDS, type FileKind } from "~/entries/sniff";
import { actionError, attempt } from "~/errors/http.server";
import { paymentsOfEntry, startCheckout } from "~/payments/service.server";
import { formatMoney } from "~/payments/states";
import type { Route } from "./+types/entries.$entryId";
import { readForm } from "~/api/body.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.entry.title ?? "Entry"} · Gatecrash` }];

async function load(request: Request, context: RequestContext, entryId: string) {
  const user = await requireUser(request, context);
  const row = await entryForViewer(entryId, user);
  if (!row) throw data({ message: "This entry does not exist, or it is not yours to see." }, { status: 404 });
  return { user, ...row };
}

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { entry, competition, event, crew, viewer } = await load(request, context, params.entryId);
  const ruleset = rulesetOf(competition.ruleset);
  const cutoff = cutoffOf(competition.deadlineAt, competition.graceMinutes);
  const extras = await entryPageExtras(entry, competition, ruleset, new URL(request.url));
  const open = extras.acceptsUploads;
  const check = await latestCheckFor(entry.id);
  const feeNotice = new URL(request.url).searchParams.get("fee");
  return {
    viewer: viewer.role,
    entry: { id: entry.id, title: entry.title, description: entry.description, state: entry.state, feeState: entry.feeState, disqualifiedReason: entry.disqualifiedReason },
    crew: { id: crew.id, name: crew.name, handle: crew.handle },
    competition: { title: competition.title, state: competition.state, slug: competition.slug, fee: competition.feeAmount > 0 ? formatMoney(competition.feeAmount, competition.feeCurrency) : null },
    event: { title: event.title, slug: event.slug, timeZone: event.timeZone },
    cutoff: cutoff?.toISOString() ?? null,
    graceMinutes: competition.graceMinutes,
    open,
    limits: Object.fromEntries(FILE_KINDS.map((k) => [k, limitFor(k, ruleset)])) as Record<FileKind, number>,
    uploads: await uploadsOfEntry(entry.id),
    payments: (await paymentsOfEntry(entry.id)).map((p) => ({ ...p, createdAt: p.createdAt.toISOString(), amountText: formatMoney(p.amount, p.currency) })),
    feeNotice: feeNotice === "returned" || feeNotice === "cancelled" ? feeNotice : null,
    report: check,
    timingRules: { modeId: ruleset.videoMode, clocksPerPixel: ruleset.clock.clocksPerPixel, window: acceptanceWindow(ruleset) },
    ...extras,
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, viewer, entry, event } = await load(request, context, params.entryId);
  const intent = parseEntryIntent(await readForm(request));
  if (!intent) throw data({ message: "Unknown action." }, { status: 400 });
  if (intent.intent === "grant-late" || intent.intent === "revoke-late") {
    if (viewer.role !== "organizer") throw data({ message: "Only the organizer grants late exceptions." }, { status: 403 });
    const out = await attempt(() => (intent.intent === "grant-late" ? grantFromForm(entry.id, user.id, event.timeZone, intent.until, intent.reason) : revokeFromForm(entry.id, user.id)));
    return out.ok ? out.value : actionError(out.error);
  }
  if (viewer.role !== "crew") throw data({ message: "Only the crew can do that." }, { status: 403 });
  if (intent.intent === "final") {
    const out = await attempt(() => pickFinal(entry.id, user.id, intent.upload));
    return out.ok ? out.value : actionError(out.error);
  }
  const out = await attempt(() => startCheckout(entry.id, user));
  if (!out.ok) return actionError(out.error);
  return redirect(out.value.url);
}

const FEE_TEXT: Record<string, { label: string; cls: string }> = {
  not_required: { label: "No fee", cls: "bg-line text-ink-soft" },
  unpaid: { label: "Fee unpaid", cls: "bg-warn-soft text-warn" },
  pending: { label: "Payment open", cls: "bg-warn-soft text-warn" },
  paid: { label: "Fee paid", cls: "bg-pass-soft text-pass" },
  refunded: { label: "Fee refunded", cls: "bg-violet-soft text-violet" },
};

export default function EntryDashboard({ loaderData, actionData }: Route.ComponentProps) {
  const d = loaderData;
  const revalidator = useRevalidator();
  const live = useLiveCheck(d.entry.id, d.report);
  const fee = FEE_TEXT[d.entry.feeState];
  const crewView = d.viewer === "crew";
  return (
    <div>
      <p className="kicker">
        {d.event.title} · <Link to={`/e/${d.event.slug}/${d.competition.slug}`} className="underline">{d.competition.title}</Link>
      </p>
      <h1 className="mt-1 text-display font-extrabold">{d.entry.title}</h1>
      <p className="mb-6 text-ink-soft">
        by <Link to={crewView ? `/crews/${d.crew.id}` : "#"} className="font-semibold">{d.crew.name}</Link> (@{d.crew.handle})
        {!crewView && <span className="ml-2 rounded-full bg-violet-soft px-2 py-0.5 text-xs font-semibold text-violet">Organizer view (read-only)</span>}
      </p>


      {actionData && "notice" in actionData && actionData.notice && (
        <p role="status" className="mb-4 rounded-md bg-pass-soft px-3 py-2 text-sm font-medium text-pass">{actionData.notice}</p>
      )}
      {actionData && "error" in actionData && actionData.error && (
        <p role="alert" className="mb-4 rounded-md bg-fail-soft px-3 py-2 text-sm font-medium text-fail">{actionData.error}</p>
      )}
      {(d.lateException || !crewView) && (
        <LateExceptionCard exception={d.lateException} organizer={!crewView} timeZone={d.event.timeZone} cutoffIso={d.cutoff} />
      )}

      <div className="mb-6 grid gap-4 md:grid-cols-3">
        <div className="card">
          <p className="kicker">Entry</p>
          <p className="mt-1 text-lg font-bold" data-testid="entry-state">{d.entry.state === "active" ? "Active" : d.entry.state}</p>
          {d.entry.disqualifiedReason && <p className="text-sm text-fail">{d.entry.disqualifiedReason}</p>}
          <p className="mt-2 text-sm text-ink-soft">
            Latest check: <LatestCheckLine check={live.check} />
          </p>
        </div>
        <div className="card">
          <p className="kicker">Entry fee</p>
          <p className="mt-1 flex items-center gap-2">
            <span className={`rounded-full px-2.5 py-0.5 text-xs font-semibold ${fee.cls}`} data-testid="fee-state">{fee.label}</span>
            {d.competition.fee && <span className="font-semibold">{d.competition.fee}</span>}
          </p>
          {d.feeNotice === "returned" && d.entry.feeState !== "paid" && (
            <p role="status" className="mt-2 text-sm text-ink-soft">Thanks — the payment is being confirmed. This page shows it once the payment service reports it.</p>
          )}
          {d.feeNotice === "cancelled" && d.entry.feeState !== "paid" && <p role="status" className="mt-2 text-sm text-ink-soft">The payment was cancelled; nothing was charged.</p>}
          {crewView && (d.entry.feeState === "unpaid" || d.entry.feeState === "pending") && (
            <Form method="post" className="mt-3">
              <input type="hidden" name="intent" value="pay" />
              <button type="submit" className="btn-primary">Pay {d.competition.fee}</button>
            </Form>
          )}
          <p className="mt-2 text-xs text-mute">Uploads do not wait for the payment. Fees, refunds and taxes follow local law; Gatecrash gives no legal advice.</p>
        </div>
        {d.cutoff ? (
          <UploadCountdown cutoffIso={d.cutoff} eventTimeZone={d.event.timeZone} graceMinutes={d.graceMinutes} />
        ) : (
          <div className="card"><p className="kicker">Uploads close</p><p className="mt-1 text-ink-soft">No deadline set yet.</p></div>
        )}
      </div>

      <div className="grid gap-6 lg:grid-cols-[1fr_1fr]">
        <section aria-label="Upload">
          {crewView && d.open ? (
            <UploadPanel entryId={d.entry.id} limits={d.limits} options={d.panel} onRecorded={() => void revalidator.revalidate()} />
          ) : (
            <div className="card text-ink-soft">{crewView ? "Uploads are closed for this entry." : "Organizers see the uploads; only the crew uploads."}</div>
          )}
        </section>
        <section>
          <h2 className="mb-3 text-lg font-bold">Uploads</h2>
          <UploadList uploads={d.uploads} timeZone={d.event.timeZone} canChoose={crewView && d.canChoose} />
        </section>
      </div>

      {d.uploads.length >= 2 && <UploadCompare uploads={d.uploads.map((u) => u.number)} comparison={d.comparison} />}

      <div className="mt-8">
        <CheckRunPanel check={live.check} offline={live.offline} timingRules={d.timingRules} />
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
