import { and, eq, like } from "drizzle-orm";
import Stripe from "stripe";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "~/db/client.server";
import { auditLog, outbox, payments, webhookEvents } from "~/db/schema";
import { env } from "~/env.server";
import { stopQueue } from "~/jobs/queue.server";
import * as webhook from "~/routes/api.payments.webhook";
import * as dashboard from "~/routes/entries.$entryId";
import * as refundRoute from "~/routes/organize.$competitionId.entries.$entryId.refund";
import { callRoute } from "../support/routes";
import { grantEventRole, makeUser, request, sessionCookie } from "../support/users";
import { callApi, entryRow, makeEntrySetup } from "./entries-support";

afterAll(async () => {
  await stopQueue();
  await closeDb();
});

const fakeUrl = () => {
  const u = process.env.PAYMENTS_FAKE_URL;
  if (!u) throw new Error("PAYMENTS_FAKE_URL is not set: run through `npm test`");
  return u;
};
const sdk = new Stripe("sk_unused_offline");

/** Signs a payload the way the payment service does (stripe SDK's test helper, same secret as the app). */
function signed(payload: string, secret = env().STRIPE_WEBHOOK_SECRET): Request {
  const header = sdk.webhooks.generateTestHeaderString({ payload, secret });
  return new Request(`${env().APP_URL}/api/payments/webhook`, { method: "POST", headers: { "content-type": "application/json", "stripe-signature": header }, body: payload });
}

async function deliver(event: unknown) {
  return callApi<{ outcome?: string; error?: { code: string } }>(webhook.action, signed(JSON.stringify(event)));
}

/** Starts the checkout from the dashboard's Pay button, pays on the fake's hosted page, and returns the fake's events. */
async function payThroughFake(entryId: string, cookie: string) {
  const out = await callRoute(dashboard.action, request(`/entries/${entryId}`, { cookie, form: { intent: "pay" } }), { entryId });
  expect(out.status).toBe(302);
  const payUrl = new URL(out.location!);
  const sessionId = payUrl.pathname.split("/").pop()!;
  const paid = await fetch(new URL(`${payUrl.pathname}/pay`, fakeUrl()), { method: "POST", redirect: "manual" });
  expect(paid.status).toBe(303);
  return { sessionId, events: await fakeEvents(sessionId) };
}

async function fakeEvents(sessionId: string): Promise<Stripe.Event[]> {
  const [p] = await db().select().from(payments).where(eq(payments.checkoutSessionId, sessionId));
  const res = (await (await fetch(`${fakeUrl()}/_fake/events`)).json()) as { events: Stripe.Event[] };
  return res.events.filter((e) => ((e.data.object as { metadata?: Record<string, string> }).metadata ?? {}).gatecrash_payment_id === p.id || (e.data.object as { id?: string }).id === sessionId);
}

const byType = (events: Stripe.Event[], type: string) => {
  const e = events.find((x) => x.type === type);
  if (!e) throw new Error(`no ${type} event`);
  return e;
};

describe("entry fee checkout and webhooks", () => {
  it("a free competition needs no fee and offers no checkout", async () => {
    const s = await makeEntrySetup({ feeAmount: 0 });
    expect((await entryRow(s.entry.id)).feeState).toBe("not_required");
    const out = await callRoute<{ error: string }>(dashboard.action, request(`/entries/${s.entry.id}`, { cookie: s.cookie, form: { intent: "pay" } }), { entryId: s.entry.id });
    expect(out.data?.error).toMatch(/no entry fee/);
  });

  it("refuses a bad signature with 400 and changes nothing", async () => {
    const s = await makeEntrySetup({ feeAmount: 1500 });
    const { events } = await payThroughFake(s.entry.id, s.cookie);
    const completed = byType(events, "checkout.session.completed");
    const forged = await callApi<{ error: { code: string } }>(webhook.action, signed(JSON.stringify(completed), "whsec_someone_else"));
    expect(forged.status).toBe(400);
    expect(forged.body.error.code).toBe("bad_signature");
    const unsigned = await callApi(webhook.action, new Request(`${env().APP_URL}/api/payments/webhook`, { method: "POST", body: JSON.stringify(completed) }));
    expect(unsigned.status).toBe(400);
    // A body changed after signing does not verify either.
    const header = sdk.webhooks.generateTestHeaderString({ payload: JSON.stringify(completed), secret: env().STRIPE_WEBHOOK_SECRET });
    const tampered = JSON.stringify({ ...completed, id: "evt_tampered" });
    const t = await callApi(webhook.action, new Request(`${env().APP_URL}/api/payments/webhook`, { method: "POST", headers: { "stripe-signature": header }, body: tampered }));
    expect(t.status).toBe(400);
    expect(await db().select().from(webhookEvents).where(eq(webhookEvents.id, completed.id))).toHaveLength(0);
    expect((await entryRow(s.entry.id)).feeState).toBe("pending");
  });

  it("applies the same event once, marks the fee paid and queues one receipt", async () => {
    const s = await makeEntrySetup({ feeAmount: 1500 });
    const { sessionId, events } = await payThroughFake(s.entry.id, s.cookie);
    const completed = byType(events, "checkout.session.completed");
    const first = await deliver(completed);
    const second = await deliver(completed);
    expect([first.status, first.body.outcome]).toEqual([200, "applied"]);
    expect([second.status, second.body.outcome]).toEqual([200, "duplicate"]);
    for (const e of events) await deliver(e); // the rest of the events, and a second copy of each
    const [p] = await db().select().from(payments).where(eq(payments.checkoutSessionId, sessionId));
    expect(p.state).toBe("paid");
    expect(p.paymentIntentId).toMatch(/^pi_/);
    expect((await entryRow(s.entry.id)).feeState).toBe("paid");
    const receipts = await db().select().from(outbox).where(and(eq(outbox.toAddress, s.entrant.email), like(outbox.subject, "Entry fee received%")));
    expect(receipts).toHaveLength(1);
    expect(receipts[0].subject).toContain("€15.00");
    expect(receipts[0].textBody).toContain(p.paymentIntentId!);
    expect(receipts[0].textBody).toMatch(/Gatecrash gives no legal advice/);
  });

  it("handles events out of order: refund events reversed, late payment events never undo the refund", async () => {
    const s = await makeEntrySetup({ feeAmount: 900 });
    const organizer = await makeUser();
    await grantEventRole(s.event.id, organizer.id, "organizer");
    const { sessionId, events } = await payThroughFake(s.entry.id, s.cookie);
    // The organizer refunds before our app heard of the payment (all pay events held back).
    await deliver(byType(events, "payment_intent.succeeded"));
    const co = await sessionCookie(organizer);
    const refunded = await callRoute(refundRoute.action, request(`/organize/${s.competition.id}/entries/${s.entry.id}/refund`, { cookie: co, form: {} }), {
      competitionId: s.competition.id,
      entryId: s.entry.id,
    });
    expect(refunded.status).toBe(302);
    const all = await fakeEvents(sessionId);
    const refundEvents = all.filter((e) => e.type === "charge.refunded" || e.type === "refund.created");
    expect(refundEvents).toHaveLength(2);
    for (const e of refundEvents.reverse()) await deliver(e);
    expect((await entryRow(s.entry.id)).feeState).toBe("refunded");
    // Now the late payment events: the state stays refunded.
    for (const e of events) await deliver(e);
    const [p] = await db().select().from(payments).where(eq(payments.checkoutSessionId, sessionId));
    expect(p.state).toBe("refunded");
    expect(p.refundedAmount).toBe(900);
    expect((await entryRow(s.entry.id)).feeState).toBe("refunded");
    const [a] = await db().select().from(auditLog).where(and(eq(auditLog.action, "fee.refund"), eq(auditLog.subjectId, s.entry.id)));
    expect(a.actorUserId).toBe(organizer.id);
    // A second refund is refused with a clear message, not an error page.
    const again = await callRoute<{ error: string }>(refundRoute.action, request(`/organize/${s.competition.id}/entries/${s.entry.id}/refund`, { cookie: co, form: {} }), {
      competitionId: s.competition.id,
      entryId: s.entry.id,
    });
    expect(again.data?.error).toMatch(/no paid fee/);
  });

  it("lets only the event's organizers refund, and only entries of that competition", async () => {
    const s = await makeEntrySetup({ feeAmount: 900 });
    const other = await makeEntrySetup({ feeAmount: 900 });
    const [organizer, outsider] = [await makeUser(), await makeUser()];
    await grantEventRole(s.event.id, organizer.id, "organizer");
    await grantEventRole(other.event.id, outsider.id, "organizer");
    const path = `/organize/${s.competition.id}/entries/${s.entry.id}/refund`;
    const params = { competitionId: s.competition.id, entryId: s.entry.id };
    expect((await callRoute(refundRoute.action, request(path, { form: {} }), params)).status).toBe(302); // to sign-in
    expect((await callRoute(refundRoute.action, request(path, { cookie: s.cookie, form: {} }), params)).status).toBe(404);
    expect((await callRoute(refundRoute.action, request(path, { cookie: await sessionCookie(outsider), form: {} }), params)).status).toBe(404);
    // The organizer of this competition cannot reach another competition's entry through it.
    const cross = await callRoute(refundRoute.loader, request(path, { cookie: await sessionCookie(organizer) }), { competitionId: s.competition.id, entryId: other.entry.id });
    expect(cross.status).toBe(404);
    expect((await callRoute(refundRoute.loader, request(path, { cookie: await sessionCookie(organizer) }), params)).status).toBe(200);
  });

  it("an open checkout is reused, and its expiry sets the fee back to unpaid", async () => {
    const s = await makeEntrySetup({ feeAmount: 700 });
    const out = await callRoute(dashboard.action, request(`/entries/${s.entry.id}`, { cookie: s.cookie, form: { intent: "pay" } }), { entryId: s.entry.id });
    const sessionId = new URL(out.location!).pathname.split("/").pop()!;
    // Pressing Pay again reuses the open checkout.
    const again = await callRoute(dashboard.action, request(`/entries/${s.entry.id}`, { cookie: s.cookie, form: { intent: "pay" } }), { entryId: s.entry.id });
    expect(again.location).toBe(out.location);
    expect((await entryRow(s.entry.id)).feeState).toBe("pending");
    await fetch(`${fakeUrl()}/v1/checkout/sessions/${sessionId}/expire`, { method: "POST", headers: { authorization: `Bearer ${env().STRIPE_SECRET_KEY}` } });
    for (const e of await fakeEvents(sessionId)) await deliver(e);
    expect((await entryRow(s.entry.id)).feeState).toBe("unpaid");
  });

  it("a validly signed event for a session the payment service reports unpaid changes nothing", async () => {
    const s = await makeEntrySetup({ feeAmount: 1500 });
    const out = await callRoute(dashboard.action, request(`/entries/${s.entry.id}`, { cookie: s.cookie, form: { intent: "pay" } }), { entryId: s.entry.id });
    const sessionId = new URL(out.location!).pathname.split("/").pop()!;
    const [p] = await db().select().from(payments).where(eq(payments.checkoutSessionId, sessionId));
    // Everything a forger could put in the body: it is signed with the right secret, but nobody paid.
    const forged = {
      id: `evt_forged_${crypto.randomUUID()}`,
      object: "event",
      type: "checkout.session.completed",
      created: Math.floor(Date.now() / 1000),
      data: { object: { id: sessionId, object: "checkout.session", status: "complete", payment_status: "paid", amount_total: 1500, currency: "eur", payment_intent: "pi_forged", metadata: { gatecrash_payment_id: p.id, entry_id: s.entry.id } } },
    };
    const res = await deliver(forged);
    expect(res.status).toBe(200);
    expect(res.body.outcome).toBe("ignored");
    const [after] = await db().select().from(payments).where(eq(payments.id, p.id));
    expect(after.state).toBe("open");
    expect(after.paymentIntentId).toBeNull();
    expect((await entryRow(s.entry.id)).feeState).toBe("pending");
  });

  it("applies what the payment service says, not the body: a paid session's event pointed at another entry pays only its own", async () => {
    const payer = await makeEntrySetup({ feeAmount: 1500 });
    const other = await makeEntrySetup({ feeAmount: 1500 });
    const start = await callRoute(dashboard.action, request(`/entries/${other.entry.id}`, { cookie: other.cookie, form: { intent: "pay" } }), { entryId: other.entry.id });
    const otherSession = new URL(start.location!).pathname.split("/").pop()!;
    const [otherPayment] = await db().select().from(payments).where(eq(payments.checkoutSessionId, otherSession));
    const { events } = await payThroughFake(payer.entry.id, payer.cookie);
    const completed = byType(events, "checkout.session.completed") as unknown as { id: string; data: { object: Record<string, unknown> } };
    const redirected = {
      ...completed,
      id: `evt_redirected_${crypto.randomUUID()}`,
      data: { object: { ...completed.data.object, metadata: { gatecrash_payment_id: otherPayment.id, entry_id: other.entry.id } } },
    };
    const res = await deliver(redirected);
    expect(res.status).toBe(200);
    expect((await entryRow(other.entry.id)).feeState).toBe("pending");
    expect((await entryRow(payer.entry.id)).feeState).toBe("paid");
  });

  it("ignores a paid session whose amount or currency differs from the fee it was opened for", async () => {
    const s = await makeEntrySetup({ feeAmount: 1500 });
    const { events, sessionId } = await payThroughFake(s.entry.id, s.cookie);
    // The organizer raised the fee after the checkout was opened: what was paid no longer matches the payment row.
    await db().update(payments).set({ amount: 2500 }).where(eq(payments.checkoutSessionId, sessionId));
    const res = await deliver(byType(events, "checkout.session.completed"));
    expect(res.body.outcome).toBe("ignored");
    expect((await entryRow(s.entry.id)).feeState).toBe("pending");
  });
});

