// Webhook deliveries: signed as Stripe signs them (verified with the SDK's constructEvent),
// duplicated on purpose, retried when the receiver fails or is down, logged, resendable.
import { afterEach, describe, expect, it } from "vitest";
import Stripe from "stripe";
import {
  TEST_WEBHOOK_SECRET,
  WebhookReceiver,
  createEntryFeeSession,
  eventLog,
  paidSession,
  pressButton,
  startFake,
  waitFor,
  type StartedFake,
} from "./test-support";

let started: StartedFake | undefined;
let receiver: WebhookReceiver | undefined;
afterEach(async () => {
  await started?.fake.close();
  await receiver?.close();
  started = undefined;
  receiver = undefined;
});

async function withReceiver(options: Parameters<typeof startFake>[0] = {}): Promise<{ started: StartedFake; receiver: WebhookReceiver }> {
  receiver = new WebhookReceiver();
  await receiver.listen();
  started = await startFake({ webhookUrl: receiver.url, webhookSecret: TEST_WEBHOOK_SECRET, ...options });
  return { started, receiver };
}

describe("webhook deliveries", () => {
  it("sends checkout.session.completed signed so that stripe.webhooks.constructEvent accepts it", async () => {
    const { started, receiver } = await withReceiver({ webhookCopies: 1 });
    const session = await createEntryFeeSession(started.stripe);
    const paidFrom = Math.floor(Date.now() / 1000);
    await pressButton(started.fake, session.id, "pay");
    await waitFor("three webhooks", () => receiver.received.length >= 3 || undefined);
    const paidBy = Math.ceil(Date.now() / 1000);

    // Like the real service, the fake promises no delivery order.
    const events = receiver.verifiedEvents(started.stripe);
    expect(events.map((event) => event.type).sort()).toEqual(["charge.succeeded", "checkout.session.completed", "payment_intent.succeeded"]);
    const completedIndex = events.findIndex((event) => event.type === "checkout.session.completed");
    const completed = events[completedIndex] as Stripe.CheckoutSessionCompletedEvent;
    expect(completed.id).toMatch(/^evt_/);
    expect(completed).toMatchObject({ object: "event", livemode: false, api_version: Stripe.API_VERSION });
    // `created` is Unix seconds (Stripe API reference, the Event object), stamped while the payment happened
    expect(completed.created).toBeGreaterThanOrEqual(paidFrom);
    expect(completed.created).toBeLessThanOrEqual(paidBy);
    expect(completed.data.object).toMatchObject({
      id: session.id,
      object: "checkout.session",
      status: "complete",
      payment_status: "paid",
      client_reference_id: "entry-e-17",
      metadata: { entryId: "e-17", crew: "demo-crew-lumen" },
      amount_total: 1500,
    });
    expect(String(completed.data.object.payment_intent)).toMatch(/^pi_/);
    expect(receiver.received[completedIndex].headers["content-type"]).toContain("application/json");

    const viaApi = await started.stripe.events.retrieve(completed.id);
    expect(viaApi.type).toBe("checkout.session.completed");
    expect(viaApi.data.object).toEqual(completed.data.object);
  });

  it("signs with the secret as given: another secret or a changed body fails verification", async () => {
    const { started, receiver } = await withReceiver({ webhookCopies: 1 });
    await paidSession(started);
    await waitFor("a webhook", () => receiver.received[0]);
    const delivery = receiver.received[0];
    const signature = String(delivery.headers["stripe-signature"]);
    expect(signature).toMatch(/^t=\d+,v1=[0-9a-f]{64}$/);
    expect(() => started.stripe.webhooks.constructEvent(delivery.body, signature, "whsec_some_other_secret")).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );
    const tampered = delivery.body.replace('"livemode": false', '"livemode": true');
    expect(tampered).not.toBe(delivery.body);
    expect(() => started.stripe.webhooks.constructEvent(tampered, signature, TEST_WEBHOOK_SECRET)).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );
  });

  it("delivers every event twice by default, and logs both deliveries", async () => {
    const { started, receiver } = await withReceiver();
    const session = await createEntryFeeSession(started.stripe);
    await started.stripe.checkout.sessions.expire(session.id);
    await waitFor("two deliveries", () => receiver.received.length >= 2 || undefined);

    const events = receiver.verifiedEvents(started.stripe);
    expect(events.map((event) => event.type)).toEqual(["checkout.session.expired", "checkout.session.expired"]);
    expect(events[1].id).toBe(events[0].id);
    expect(events[0].data.object).toMatchObject({ id: session.id, status: "expired" });

    const log = await waitFor("a settled delivery log", async () => {
      const current = await eventLog(started.fake);
      return current.pending.length === 0 ? current : undefined;
    });
    expect(log.events).toHaveLength(1);
    const summary = log.deliveries.map((d) => [d.copy, d.attempt, d.status_code, d.succeeded]);
    expect(summary.sort()).toEqual([
      [1, 1, 200, true],
      [2, 1, 200, true],
    ]);
  });

  it("sends refund.created and charge.refunded for a refund", async () => {
    const { started, receiver } = await withReceiver({ webhookCopies: 1 });
    const { paymentIntentId } = await paidSession(started, 2000);
    const refund = await started.stripe.refunds.create({ payment_intent: paymentIntentId, amount: 500 });
    await waitFor("five webhooks", () => receiver.received.length >= 5 || undefined);
    const events = receiver.verifiedEvents(started.stripe);
    const created = events.find((event) => event.type === "refund.created");
    const refunded = events.find((event) => event.type === "charge.refunded");
    expect(created?.data.object).toMatchObject({ id: refund.id, amount: 500, status: "succeeded" });
    expect(refunded?.data.object).toMatchObject({ object: "charge", amount_refunded: 500, refunded: false });
    expect(refunded?.data.previous_attributes).toEqual({ amount_refunded: 0, refunded: false });
  });

  it("retries with backoff while the receiver answers 500, then stops once it answers 200", async () => {
    const { started, receiver } = await withReceiver({ webhookCopies: 1, webhookRetryDelaysMs: [40, 40, 40, 40] });
    receiver.status = 500;
    const session = await createEntryFeeSession(started.stripe);
    await started.stripe.checkout.sessions.expire(session.id);
    await waitFor("two failed attempts", () => receiver.received.length >= 2 || undefined);
    receiver.status = 200;
    const log = await waitFor("a successful attempt", async () => {
      const current = await eventLog(started.fake);
      return current.deliveries.some((d) => d.succeeded) && current.pending.length === 0 ? current : undefined;
    });
    const attempts = log.deliveries;
    expect(attempts.slice(0, -1).every((d) => !d.succeeded && d.status_code === 500 && d.next_attempt_at !== null)).toBe(true);
    expect(attempts.at(-1)).toMatchObject({ succeeded: true, status_code: 200, next_attempt_at: null });
    expect(attempts.map((d) => d.attempt)).toEqual(attempts.map((_, index) => index + 1));
    // Every attempt is freshly signed and verifies.
    expect(receiver.verifiedEvents(started.stripe).every((event) => event.type === "checkout.session.expired")).toBe(true);
  });

  it("keeps retrying while the receiver is down and delivers once it is back", async () => {
    receiver = new WebhookReceiver();
    await receiver.listen();
    const port = receiver.port;
    await receiver.close();
    started = await startFake({ webhookUrl: receiver.url, webhookSecret: TEST_WEBHOOK_SECRET, webhookCopies: 1, webhookRetryDelaysMs: [50, 100, 200, 400, 800, 1600] });
    const fake = started.fake;
    const session = await createEntryFeeSession(started.stripe);
    await started.stripe.checkout.sessions.expire(session.id);
    const failed = await waitFor("a refused connection in the log", async () => (await eventLog(fake)).deliveries[0]);
    expect(failed).toMatchObject({ succeeded: false, status_code: null, attempt: 1 });
    expect(failed.error).toBeTruthy();

    receiver.port = port;
    await receiver.listen();
    const delivered = await waitFor("the delivery after the receiver came back", () => receiver?.received[0]);
    const event = started.stripe.webhooks.constructEvent(delivered.body, String(delivered.headers["stripe-signature"]), TEST_WEBHOOK_SECRET);
    expect(event.type).toBe("checkout.session.expired");
    const log = await waitFor("the log to show success", async () => {
      const current = await eventLog(fake);
      return current.deliveries.some((d) => d.succeeded) ? current : undefined;
    });
    expect(log.deliveries.at(-1)?.attempt).toBeGreaterThan(1);
  });

  it("gives up after the configured number of attempts", async () => {
    const { started, receiver } = await withReceiver({ webhookCopies: 1, webhookRetryDelaysMs: [20, 20] });
    receiver.status = 503;
    const session = await createEntryFeeSession(started.stripe);
    await started.stripe.checkout.sessions.expire(session.id);
    const log = await waitFor("the chain to end", async () => {
      const current = await eventLog(started.fake);
      return current.deliveries.length > 0 && current.pending.length === 0 ? current : undefined;
    });
    expect(log.deliveries.map((d) => d.attempt)).toEqual([1, 2, 3]);
    expect(log.deliveries.every((d) => !d.succeeded)).toBe(true);
    expect(log.deliveries.at(-1)?.next_attempt_at).toBeNull();
    expect(receiver.received).toHaveLength(3);
  });

  it("resends an event on request", async () => {
    const { started, receiver } = await withReceiver({ webhookCopies: 1 });
    const session = await createEntryFeeSession(started.stripe);
    await started.stripe.checkout.sessions.expire(session.id);
    await waitFor("the first delivery", () => receiver.received[0]);
    const [event] = (await eventLog(started.fake, "checkout.session.expired")).events;

    const response = await fetch(`${started.fake.url}/_fake/events/${event.id}/resend`, { method: "POST" });
    expect(response.status).toBe(202);
    expect(await response.json()).toEqual({ event_id: event.id, copy: 2 });
    await waitFor("the resent delivery", () => receiver.received[1]);
    expect(receiver.verifiedEvents(started.stripe).map((e) => e.id)).toEqual([event.id, event.id]);

    const missing = await fetch(`${started.fake.url}/_fake/events/evt_nothing/resend`, { method: "POST" });
    expect(missing.status).toBe(404);
    expect(await missing.json()).toMatchObject({ error: { code: "resource_missing" } });
  });

  it("records events without delivering when no webhook URL is set", async () => {
    started = await startFake();
    const { paymentIntentId } = await paidSession(started);
    await started.stripe.refunds.create({ payment_intent: paymentIntentId });
    const log = await eventLog(started.fake);
    expect(log.webhooks_enabled).toBe(false);
    expect(log.events.map((e) => e.type)).toEqual([
      "charge.succeeded",
      "payment_intent.succeeded",
      "checkout.session.completed",
      "refund.created",
      "charge.refunded",
    ]);
    expect(log.deliveries).toEqual([]);
  });
});
