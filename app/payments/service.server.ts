import { and, eq, inArray } from "drizzle-orm";
import Stripe from "stripe";
import { audit } from "~/audit/log.server";
import { db } from "~/db/client.server";
import { competitions, crewMembers, crews, entries, events, payments, user, webhookEvents } from "~/db/schema";
import { env } from "~/env.server";
import { enqueueMail } from "~/mail/outbox.server";
import { composeMail } from "~/mail/templates";
import { applyEvidence, feeStateOf, formatMoney, type Evidence, type PaymentState } from "./states";
import { stripe } from "./stripe.server";

/**
 * Entry fees: a Checkout session per attempt, webhooks applied once each (the event id is stored in the same
 * transaction as the change) and in any order (./states), a receipt per payment, refunds by the organizer.
 * Fees, refunds and taxes follow local law; Gatecrash gives no legal advice.
 */
const META = "gatecrash_payment_id";

export type PayOutcome = { ok: true; url: string } | { ok: false; message: string };

export async function startCheckout(entryId: string, payer: { id: string; email: string }): Promise<PayOutcome> {
  const [row] = await db()
    .select({ entry: entries, competition: competitions, event: events })
    .from(entries)
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .innerJoin(events, eq(events.id, competitions.eventId))
    .where(eq(entries.id, entryId));
  if (!row) return { ok: false, message: "That entry was not found." };
  const { entry, competition } = row;
  if (competition.feeAmount === 0) return { ok: false, message: "This competition has no entry fee." };
  if (entry.feeState === "paid") return { ok: false, message: "The entry fee is already paid." };
  if (entry.feeState === "refunded") return { ok: false, message: "The entry fee was refunded. Ask the organizers if you want to enter again." };
  // An open checkout of this entry is reused, so a double click does not make two.
  const open = await db().select().from(payments).where(and(eq(payments.entryId, entryId), eq(payments.state, "open")));
  for (const p of open) {
    const s = await stripe().checkout.sessions.retrieve(p.checkoutSessionId);
    if (s.status === "open" && s.url) return { ok: true, url: s.url };
  }
  const paymentId = crypto.randomUUID();
  const base = env().APP_URL;
  const session = await stripe().checkout.sessions.create(
    {
      mode: "payment",
      line_items: [
        {
          quantity: 1,
          price_data: {
            currency: competition.feeCurrency,
            unit_amount: competition.feeAmount,
            product_data: { name: `Entry fee: ${competition.title}`, description: `${entry.title} — ${row.event.title}` },
          },
        },
      ],
      client_reference_id: entryId,
      customer_email: payer.email,
      metadata: { [META]: paymentId, entry_id: entryId },
      payment_intent_data: { metadata: { [META]: paymentId, entry_id: entryId } },
      success_url: `${base}/entries/${entryId}?fee=returned`,
      cancel_url: `${base}/entries/${entryId}?fee=cancelled`,
    },
    { idempotencyKey: `checkout-${paymentId}` },
  );
  await db().transaction(async (tx) => {
    await tx.insert(payments).values({ id: paymentId, entryId, checkoutSessionId: session.id, amount: competition.feeAmount, currency: competition.feeCurrency, state: "open" });
    await syncFeeState(tx, entryId);
  });
  await audit({ actorUserId: payer.id, eventId: competition.eventId, action: "fee.checkout", subjectType: "entry", subjectId: entryId, details: { paymentId } });
  if (!session.url) return { ok: false, message: "The payment service gave no payment page. Try again." };
  return { ok: true, url: session.url };
}

type Tx = Parameters<Parameters<ReturnType<typeof db>["transaction"]>[0]>[0];

async function syncFeeState(tx: Tx, entryId: string): Promise<void> {
  const [e] = await tx.select({ feeAmount: competitions.feeAmount }).from(entries).innerJoin(competitions, eq(competitions.id, entries.competitionId)).where(eq(entries.id, entryId));
  const ps = await tx.select({ state: payments.state }).from(payments).where(eq(payments.entryId, entryId));
  await tx
    .update(entries)
    .set({ feeState: feeStateOf(e.feeAmount, ps as { state: PaymentState }[]), updatedAt: new Date() })
    .where(eq(entries.id, entryId));
}

/** What an event says about which payment, and what it proves. */
function readEvent(event: Stripe.Event): { paymentId?: string; sessionId?: string; paymentIntentId?: string; evidence: Evidence } | null {
  const obj = event.data.object as unknown as Record<string, unknown>;
  const meta = (obj.metadata ?? {}) as Record<string, string>;
  const pi = (v: unknown) => (typeof v === "string" ? v : v && typeof v === "object" ? ((v as { id?: string }).id ?? undefined) : undefined);
  switch (event.type) {
    case "checkout.session.completed": {
      const s = event.data.object;
      if (s.payment_status !== "paid") return null;
      return { paymentId: meta[META], sessionId: s.id, paymentIntentId: pi(s.payment_intent), evidence: { kind: "paid", paymentIntentId: pi(s.payment_intent) ?? null } };
    }
    case "checkout.session.expired":
      return { paymentId: meta[META], sessionId: event.data.object.id, evidence: { kind: "expired" } };
    case "payment_intent.succeeded":
      return { paymentId: meta[META], paymentIntentId: event.data.object.id, evidence: { kind: "paid", paymentIntentId: event.data.object.id } };
    case "charge.succeeded": {
      const c = event.data.object;
      return { paymentId: meta[META], paymentIntentId: pi(c.payment_intent), evidence: { kind: "paid", paymentIntentId: pi(c.payment_intent) ?? null } };
    }
    case "charge.refunded": {
      const c = event.data.object;
      return { paymentId: meta[META], paymentIntentId: pi(c.payment_intent), evidence: { kind: "refunded", paymentIntentId: pi(c.payment_intent) ?? null, refundedTotal: c.amount_refunded } };
    }
    default:
      // refund.created is recorded; its charge.refunded twin carries the cumulative amount that moves the state.
      return null;
  }
}

export type WebhookOutcome = "applied" | "duplicate" | "ignored";

/** Applies one verified event exactly once. A repeat finds its id in webhook_events and changes nothing. */
export async function applyWebhookEvent(event: Stripe.Event): Promise<WebhookOutcome> {
  const read = readEvent(event);
  const outcome = await db().transaction(async (tx) => {
    const [fresh] = await tx
      .insert(webhookEvents)
      .values({ id: event.id, type: event.type, objectCreatedAt: new Date(event.created * 1000), payload: event as unknown as Record<string, unknown> })
      .onConflictDoNothing({ target: webhookEvents.id })
      .returning({ id: webhookEvents.id });
    if (!fresh) return { result: "duplicate" as const, paymentId: undefined };
    if (!read) return { result: "ignored" as const, paymentId: undefined };
    const where = read.paymentId
      ? eq(payments.id, read.paymentId)
      : read.sessionId
        ? eq(payments.checkoutSessionId, read.sessionId)
        : read.paymentIntentId
          ? eq(payments.paymentIntentId, read.paymentIntentId)
          : undefined;
    if (!where || (read.paymentId && !/^[0-9a-f-]{36}$/i.test(read.paymentId))) return { result: "ignored" as const, paymentId: undefined };
    const [p] = await tx.select().from(payments).where(where).for("update");
    if (!p) return { result: "ignored" as const, paymentId: undefined };
    const before = { state: p.state as PaymentState, amount: p.amount, refundedAmount: p.refundedAmount, paymentIntentId: p.paymentIntentId };
    const after = applyEvidence(before, read.evidence);
    await tx
      .update(payments)
      .set({ state: after.state, refundedAmount: after.refundedAmount, paymentIntentId: after.paymentIntentId, updatedAt: new Date() })
      .where(eq(payments.id, p.id));
    await syncFeeState(tx, p.entryId);
    return { result: "applied" as const, paymentId: p.id };
  });
  // The receipt goes out after the commit; its dedupe key makes a repeat (or a retry after a crash) harmless.
  if (outcome.paymentId) await sendFeeReceipt(outcome.paymentId);
  return outcome.result;
}

/** One receipt per payment, to the crew, once the payment is paid (also if it was refunded since). */
export async function sendFeeReceipt(paymentId: string): Promise<void> {
  const [row] = await db()
    .select({ payment: payments, entry: entries, competition: competitions, event: events, crew: crews })
    .from(payments)
    .innerJoin(entries, eq(entries.id, payments.entryId))
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .innerJoin(events, eq(events.id, competitions.eventId))
    .innerJoin(crews, eq(crews.id, entries.crewId))
    .where(eq(payments.id, paymentId));
  if (!row || !["paid", "partially_refunded", "refunded"].includes(row.payment.state)) return;
  const members = await db().select({ id: user.id, email: user.email }).from(crewMembers).innerJoin(user, eq(user.id, crewMembers.userId)).where(eq(crewMembers.crewId, row.crew.id));
  const amount = formatMoney(row.payment.amount, row.payment.currency);
  for (const m of members) {
    await enqueueMail(
      composeMail(
        m.email,
        `Entry fee received: ${amount} for ${row.entry.title}`,
        [
          `Gatecrash recorded the entry fee of ${amount} for "${row.entry.title}" by ${row.crew.name} in ${row.competition.title} (${row.event.title}).`,
          `Payment reference: ${row.payment.paymentIntentId ?? row.payment.checkoutSessionId}\nRecorded: ${row.payment.updatedAt.toISOString()} (UTC)`,
          { text: "Open the entry", href: `${env().APP_URL}/entries/${row.entry.id}` },
          "This is a confirmation of payment, not a tax invoice. Fees, refunds and taxes follow local law; Gatecrash gives no legal advice. Ask the organizers about refunds.",
        ],
        `fee-receipt:${row.payment.id}:${m.id}`,
      ),
    );
  }
}

export type RefundOutcome = { ok: true; refundId: string } | { ok: false; message: string };

/** The organizer refunds an entry's paid fee through the SDK; the webhook confirms it and moves the states. */
export async function refundEntryFee(competitionId: string, entryId: string, organizerId: string): Promise<RefundOutcome> {
  const [row] = await db()
    .select({ entry: entries, competition: competitions })
    .from(entries)
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .where(and(eq(entries.id, entryId), eq(entries.competitionId, competitionId)));
  if (!row) return { ok: false, message: "That entry is not in this competition." };
  const [p] = await db()
    .select()
    .from(payments)
    .where(and(eq(payments.entryId, entryId), inArray(payments.state, ["paid", "partially_refunded"])));
  if (!p || !p.paymentIntentId) return { ok: false, message: "This entry has no paid fee to refund." };
  let refund: Stripe.Refund;
  try {
    refund = await stripe().refunds.create(
      { payment_intent: p.paymentIntentId, metadata: { [META]: p.id } },
      { idempotencyKey: `refund-${p.id}-${p.refundedAmount}` },
    );
  } catch (e) {
    // The service refuses (e.g. already refunded): say why; anything else is a real failure and propagates.
    if (e instanceof Stripe.errors.StripeInvalidRequestError) return { ok: false, message: `The payment service refused the refund: ${e.message}` };
    throw e;
  }
  await audit({
    actorUserId: organizerId,
    eventId: row.competition.eventId,
    action: "fee.refund",
    subjectType: "entry",
    subjectId: entryId,
    details: { paymentId: p.id, refundId: refund.id, amount: refund.amount, currency: refund.currency },
  });
  return { ok: true, refundId: refund.id };
}

export async function paymentsOfEntry(entryId: string) {
  return db()
    .select({ id: payments.id, state: payments.state, amount: payments.amount, currency: payments.currency, refundedAmount: payments.refundedAmount, createdAt: payments.createdAt })
    .from(payments)
    .where(eq(payments.entryId, entryId))
    .orderBy(payments.createdAt);
}
