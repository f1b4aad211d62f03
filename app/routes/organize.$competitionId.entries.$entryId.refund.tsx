import { data, Form, redirect } from "react-router";
import type { RequestContext } from "~/auth/guards.server";
import { requireCompetitionRole } from "~/competitions/access.server";
import { actionError, attempt } from "~/errors/http.server";
import { entryForRefund, paymentsOfEntry, refundEntryFee } from "~/payments/service.server";
import { formatMoney } from "~/payments/states";
import { safeRedirect } from "~/auth/redirect";
import type { Route } from "./+types/organize.$competitionId.entries.$entryId.refund";
import { readForm } from "~/api/body.server";

export const meta: Route.MetaFunction = () => [{ title: "Refund entry fee · Gatecrash" }];

/** The organizer of the competition's event only; an id from elsewhere is a 404 before anything else. */
async function load(request: Request, context: RequestContext, competitionId: string, entryId: string) {
  const { user, competition: c } = await requireCompetitionRole(request, context, competitionId, "organizer");
  const row = await entryForRefund(c.id, entryId);
  if (!row) throw data({ message: "That entry is not in this competition." }, { status: 404 });
  return { user, competition: c, ...row };
}

const safeBack = (v: FormDataEntryValue | null) => {
  const path = safeRedirect(v, null);
  return path?.startsWith("/organize/") ? path : null;
};

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { competition, entry, crew } = await load(request, context, params.competitionId, params.entryId);
  const ps = await paymentsOfEntry(entry.id);
  return {
    competition: { id: competition.id, title: competition.title },
    entry: { id: entry.id, title: entry.title, feeState: entry.feeState },
    crew: crew.name,
    payments: ps.map((p) => ({ id: p.id, state: p.state, amount: formatMoney(p.amount, p.currency), refunded: formatMoney(p.refundedAmount, p.currency) })),
    requested: new URL(request.url).searchParams.get("requested") === "1",
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, competition, entry } = await load(request, context, params.competitionId, params.entryId);
  const form = await readForm(request);
  const out = await attempt(() => refundEntryFee(competition.id, entry.id, user.id));
  if (!out.ok) return actionError(out.error);
  return redirect(safeBack(form.get("redirectTo")) ?? `/organize/${competition.id}/entries/${entry.id}/refund?requested=1`);
}

export default function Refund({ loaderData, actionData }: Route.ComponentProps) {
  const d = loaderData;
  const paid = d.payments.find((p) => p.state === "paid" || p.state === "partially_refunded");
  return (
    <div className="mx-auto max-w-lg">
      <p className="kicker">Organizer · {d.competition.title}</p>
      <h1 className="mb-4 mt-1 text-display font-extrabold">Refund the entry fee</h1>
      <p className="mb-4 text-ink-soft">
        {d.entry.title} by {d.crew}. Fee state: <strong data-testid="fee-state">{d.entry.feeState}</strong>
      </p>
      {d.requested && <p role="status" className="card mb-4">Refund requested. The fee state changes once the payment service confirms it.</p>}
      {actionData?.error && <p role="alert" className="field-error mb-4">{actionData.error}</p>}
      {paid ? (
        <Form method="post" className="card">
          <p className="mb-4">Refund {paid.amount} to the crew's payment method. This cannot be undone.</p>
          <button type="submit" className="btn-signal">Refund {paid.amount}</button>
        </Form>
      ) : (
        <p className="card text-ink-soft">There is no paid fee to refund.</p>
      )}
      <p className="mt-4 text-xs text-mute">Fees, refunds and taxes follow local law; Gatecrash gives no legal advice.</p>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
