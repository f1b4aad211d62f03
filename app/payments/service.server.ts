import { and, eq, inArray } from "drizzle-orm";
import Stripe from "stripe";
import { audit } from "~/audit/log.server";
import { db, type Tx } from "~/db/client.server";
import { competitions, crewMembers, crews, entries, events, payments, user, webhookEvents } from "~/db/schema";
import { env } from "~/env.server";
import { enqueueMail } from "~/mail/outbox.server";
import { composeMail } from "~/mail/templates";
import { applyEvidence, feeStateOf, formatMoney, type Evidence, type PaymentState } from "./states";
import { stripe } from "./stripe.server";
import { isId } from "~/security/ids";
import { AppError, conflict, notFound } from "~/errors/app-error";

/**
 * Entry fees: a Checkout session per attempt, webhooks applied once each (the event id is stored in the same
 * transaction as the change) and in any order (./states), a receipt per payment, refunds by the organizer.
 * Fees, refunds and taxes follow local law; Gatecrash gives no legal advice.
 */
const META = "gatecrash_payment_id";

/** The payment page to send the payer to; refusals are AppErrors. */
export async function startCheckout(entryId: string, payer: { id: string; email: string }): Promise<{ url: string }> {
  const [row] = await db()
    .select({ entry: entries, competition: competitions, event: events })
    .from(entries)
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .innerJoin(events, eq(events.id, competitions.eventId))
    .where(eq(entries.id, entryId));
  if (!row) throw notFound("That entry was not found.");
  const { entry, competition } = row;
  if (competition.feeAmount === 0) throw conflict("no_fee", "This competition has no entry fee.");
  if (entry.feeState === "paid") throw conflict("fee_paid", "The entry fee is already paid.");
  if (entry.feeState === "refunded") throw conflict("fee_refunded", "The entry fee was refunded. Ask the organizers if you want to enter again.");
  // An open checkout of this entry is reused, so a double click does not make two.
  const open = await db().select().from(payments).where(and(eq(payments.entryId, entryId), eq(payments.state, "open")));
  for (const p of open) {
    const s = await stripe().checkout.sessions.retrieve(p.checkoutSessionId);
    if (s.status === "open" && s.url) return { url: s.url };
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
  if (!session.url) throw new AppError(502, "no_payment_page", "The payment service gave no payment page. Try again.");
  return { url: session.url };
}


async function syncFeeState(tx: Tx, entryId: string): Promise<void> {
  const [e] = await tx.select({ feeAmount: competitions.feeAmount }).from(entries).innerJoin(competitions, eq(competitions.id, entries.competitionId)).where(eq(entries.id, entryId));
  const ps = await tx.select({ state: payments.state }).from(payments).where(eq(payments.entryId, entryId));
  await tx
    .update(entries)
    .set({ feeState: feeStateOf(e.feeAmount, ps as { state: PaymentState }[]), updatedAt: new Date() })
    .where(eq(entries.id, entryId));
}

/**
 * What the payment service itself says about the object an event names. The event body is only a pointer: after
 * the signature, the session (or payment, or charge) is retrieved through the SDK and only the service's own answer
 * counts — its status, amount, currency and the payment id in its metadata. An event whose object the service
 * reports as not paid (or does not know) proves nothing.
 */
interface ServiceFacts {
  paymentId?: string;
  entryId?: string;
  sessionId?: string;
  paymentIntentId?: string;
  /** What was charged, in minor units; checked against the payment row (not for an expiry). */
  amount?: number;
  currency?: string;
  evidence: Evidence;
}

const idOf = (v: unknown): string | undefined => (typeof v === "string" ? v : v && typeof v === "object" ? ((v as { id?: string }).id ?? undefined) : undefined);

function fromMetadata(meta: Stripe.Metadata | null | undefined): Pick<ServiceFacts, "paymentId" | "entryId"> {
  return { paymentId: meta?.[META] || undefined, entryId: meta?.entry_id || undefined };
}

async function factsFromService(event: Stripe.Event): Promise<ServiceFacts | null> {
  const objectId = idOf(event.data.object);
  if (!objectId) return null;
  try {
    switch (event.type) {
      case "checkout.session.completed":
      case "checkout.session.expired": {
        const s = await stripe().checkout.sessions.retrieve(objectId);
        const base = { ...fromMetadata(s.metadata), sessionId: s.id, amount: s.amount_total ?? undefined, currency: s.currency ?? undefined };
        if (s.status === "complete" && s.payment_status === "paid") return { ...base, paymentIntentId: idOf(s.payment_intent), evidence: { kind: "paid", paymentIntentId: idOf(s.payment_intent) ?? null } };
        if (s.status === "expired") return { ...base, evidence: { kind: "expired" } };
        return null;
      }
      case "payment_intent.succeeded": {
        const pi = await stripe().paymentIntents.retrieve(objectId);
        if (pi.status !== "succeeded") return null;
        return { ...fromMetadata(pi.metadata), paymentIntentId: pi.id, amount: pi.amount_received, currency: pi.currency, evidence: { kind: "paid", paymentIntentId: pi.id } };
      }
      case "charge.succeeded":
      case "charge.refunded": {
        const c = await stripe().charges.retrieve(objectId);
        const pi = idOf(c.payment_intent);
        const base = { ...fromMetadata(c.metadata), paymentIntentId: pi, amount: c.amount, currency: c.currency };
        if (event.type === "charge.refunded") return c.amount_refunded > 0 ? { ...base, evidence: { kind: "refunded", paymentIntentId: pi ?? null, refundedTotal: c.amount_refunded } } : null;
        return c.paid && c.status === "succeeded" ? { ...base, evidence: { kind: "paid", paymentIntentId: pi ?? null } } : null;
      }
      default:
        // refund.created is recorded; its charge.refunded twin carries the cumulative amount that moves the state.
        return null;
    }
  } catch (e) {
    // An id the service does not know proves nothing; any other failure (the service away) propagates, so the
    // webhook answers 5xx and the service delivers the event again.
    if (e instanceof Stripe.errors.StripeInvalidRequestError && e.statusCode === 404) return null;
    throw e;
  }
}

type PaymentRow = typeof payments.$inferSelect;

/** The service's facts belong to this payment row: same checkout, same intent once known, same entry, same money. */
function factsFit(p: PaymentRow, f: ServiceFacts): boolean {
  if (f.sessionId && f.sessionId !== p.checkoutSessionId) return false;
  if (f.paymentIntentId && p.paymentIntentId && f.paymentIntentId !== p.paymentIntentId) return false;
  if (f.entryId && f.entryId !== p.entryId) return false;
  if (f.evidence.kind === "expired") return true;
  return f.amount === p.amount && f.currency?.toLowerCase() === p.currency.toLowerCase();
}

export type WebhookOutcome = "applied" | "duplicate" | "ignored";

/** Applies one verified event exactly once. A repeat finds its id in webhook_events and changes nothing. */
export async function applyWebhookEvent(event: Stripe.Event): Promise<WebhookOutcome> {
  // Asked before the transaction: no pool connection is held while the payment service answers.
  const facts = await factsFromService(event);
  const outcome = await db().transaction(async (tx) => {
    const [fresh] = await tx
      .insert(webhookEvents)
      .values({ id: event.id, type: event.type, objectCreatedAt: new Date(event.created * 1000), payload: event as unknown as Record<string, unknown> })
      .onConflictDoNothing({ target: webhookEvents.id })
      .returning({ id: webhookEvents.id });
    if (!fresh) return { result: "duplicate" as const, paymentId: undefined };
    if (!facts) return { result: "ignored" as const, paymentId: undefined };
    const where =
      facts.paymentId && isId(facts.paymentId)
        ? eq(payments.id, facts.paymentId)
        : facts.sessionId
          ? eq(payments.checkoutSessionId, facts.sessionId)
          : facts.paymentIntentId
            ? eq(payments.paymentIntentId, facts.paymentIntentId)
            : undefined;
    if (!where) return { result: "ignored" as const, paymentId: undefined };
    const [p] = await tx.select().from(payments).where(where).for("update");
    if (!p || !factsFit(p, facts)) return { result: "ignored" as const, paymentId: undefined };
    const before = { state: p.state as PaymentState, amount: p.amount, refundedAmount: p.refundedAmount, paymentIntentId: p.paymentIntentId };
    const after = applyEvidence(before, facts.evidence);
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

/** The organizer refunds an entry's paid fee through the SDK; the webhook confirms it and moves the states. */
export async function refundEntryFee(competitionId: string, entryId: string, organizerId: string): Promise<{ refundId: string }> {
  const [row] = await db()
    .select({ entry: entries, competition: competitions })
    .from(entries)
    .innerJoin(competitions, eq(competitions.id, entries.competitionId))
    .where(and(eq(entries.id, entryId), eq(entries.competitionId, competitionId)));
  if (!row) throw notFound("That entry is not in this competition.");
  const [p] = await db()
    .select()
    .from(payments)
    .where(and(eq(payments.entryId, entryId), inArray(payments.state, ["paid", "partially_refunded"])));
  if (!p || !p.paymentIntentId) throw conflict("nothing_to_refund", "This entry has no paid fee to refund.");
  let refund: Stripe.Refund;
  try {
    refund = await stripe().refunds.create(
      { payment_intent: p.paymentIntentId, metadata: { [META]: p.id } },
      { idempotencyKey: `refund-${p.id}-${p.refundedAmount}` },
    );
  } catch (e) {
    // The service refuses (e.g. already refunded): say why; anything else is a real failure and propagates.
    if (e instanceof Stripe.errors.StripeInvalidRequestError) throw new AppError(502, "refund_refused", `The payment service refused the refund: ${e.message}`);
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
  return { refundId: refund.id };
}

/**
 * An entry of one competition with its crew, for that competition's organizer (the caller's guard): null for an
 * entry elsewhere, which the refund page answers with 404.
 */
export async function entryForRefund(competitionId: string, entryId: string) {
  if (!isId(entryId)) return null;
  const [row] = await db()
    .select({ entry: entries, crew: crews })
    .from(entries)
    .innerJoin(crews, eq(crews.id, entries.crewId))
    .where(and(eq(entries.id, entryId), eq(entries.competitionId, competitionId)));
  return row ?? null;
}

export async function paymentsOfEntry(entryId: string) {
  return db()
    .select({ id: payments.id, state: payments.state, amount: payments.amount, currency: payments.currency, refundedAmount: payments.refundedAmount, createdAt: payments.createdAt })
    .from(payments)
    .where(eq(payments.entryId, entryId))
    .orderBy(payments.createdAt);
}
