// API keys and Idempotency-Key behaviour, through the real stripe SDK.
import { afterEach, describe, expect, it } from "vitest";
import Stripe from "stripe";
import { createEntryFeeSession, paidSession, startFake, stripeClient, TEST_SECRET_KEY, type StartedFake } from "./test-support";

let started: StartedFake | undefined;
afterEach(async () => {
  await started?.fake.close();
  started = undefined;
});

describe("API keys", () => {
  it("refuses a wrong key with 401 authentication_error", async () => {
    started = await startFake();
    const intruder = stripeClient(started.fake.port, "sk_test_not_the_right_one");
    const attempt = createEntryFeeSession(intruder);
    await expect(attempt).rejects.toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    await expect(attempt).rejects.toMatchObject({ statusCode: 401, raw: { type: "authentication_error" } });
  });

  it("refuses a request without a key, and does not leak the real key", async () => {
    started = await startFake();
    const response = await fetch(`${started.fake.url}/v1/checkout/sessions/cs_test_x`);
    expect(response.status).toBe(401);
    const body = (await response.json()) as { error: { type: string; message: string } };
    expect(body.error.type).toBe("authentication_error");
    expect(JSON.stringify(body)).not.toContain(TEST_SECRET_KEY);
  });

  it("accepts the key as HTTP Basic user name too", async () => {
    started = await startFake();
    const response = await fetch(`${started.fake.url}/v1/checkout/sessions/cs_test_x`, {
      headers: { Authorization: `Basic ${Buffer.from(`${TEST_SECRET_KEY}:`).toString("base64")}` },
    });
    expect(response.status).toBe(404);
  });
});

describe("Idempotency-Key", () => {
  it("returns the same session for the same key and parameters", async () => {
    started = await startFake();
    const { stripe } = started;
    const params: Stripe.Checkout.SessionCreateParams = {
      mode: "payment",
      success_url: "http://127.0.0.1:9/ok",
      line_items: [{ quantity: 1, price_data: { currency: "eur", unit_amount: 700, product_data: { name: "Entry fee" } } }],
    };
    const a = await stripe.checkout.sessions.create(params, { idempotencyKey: "entry-e-42-fee" });
    const b = await stripe.checkout.sessions.create(params, { idempotencyKey: "entry-e-42-fee" });
    expect(b.id).toBe(a.id);
    expect(b).toEqual(a);
    expect(b.lastResponse.headers["idempotent-replayed"]).toBe("true");
    const other = await stripe.checkout.sessions.create(params, { idempotencyKey: "entry-e-43-fee" });
    expect(other.id).not.toBe(a.id);
  });

  it("refuses the same key with other parameters (idempotency_error)", async () => {
    started = await startFake();
    const { stripe } = started;
    await stripe.checkout.sessions.create(
      { mode: "payment", success_url: "http://127.0.0.1:9/ok", line_items: [{ quantity: 1, price_data: { currency: "eur", unit_amount: 700, product_data: { name: "Entry fee" } } }] },
      { idempotencyKey: "k-1" },
    );
    const reused = stripe.checkout.sessions.create(
      { mode: "payment", success_url: "http://127.0.0.1:9/ok", line_items: [{ quantity: 1, price_data: { currency: "eur", unit_amount: 900, product_data: { name: "Entry fee" } } }] },
      { idempotencyKey: "k-1" },
    );
    await expect(reused).rejects.toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    await expect(reused).rejects.toMatchObject({ statusCode: 400 });
  });

  it("a retried refund with the same key refunds once", async () => {
    started = await startFake();
    const { stripe } = started;
    const { paymentIntentId } = await paidSession(started, 2000);
    const a = await stripe.refunds.create({ payment_intent: paymentIntentId, amount: 600 }, { idempotencyKey: "refund-e-17-1" });
    const b = await stripe.refunds.create({ payment_intent: paymentIntentId, amount: 600 }, { idempotencyKey: "refund-e-17-1" });
    expect(b.id).toBe(a.id);
    const charge = await stripe.charges.retrieve(String(a.charge));
    expect(charge.amount_refunded).toBe(600);
  });

  it("does not save a refused request, so the key can be used once the input is fixed", async () => {
    started = await startFake();
    const { stripe } = started;
    const { paymentIntentId } = await paidSession(started, 2000);
    await expect(stripe.refunds.create({ payment_intent: paymentIntentId, amount: 5000 }, { idempotencyKey: "refund-k" })).rejects.toMatchObject({ statusCode: 400 });
    const refund = await stripe.refunds.create({ payment_intent: paymentIntentId, amount: 2000 }, { idempotencyKey: "refund-k" });
    expect(refund.amount).toBe(2000);
  });
});
