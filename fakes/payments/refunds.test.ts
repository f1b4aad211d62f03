// Refunds against a paid entry fee, through the real stripe SDK.
import { afterEach, describe, expect, it } from "vitest";
import Stripe from "stripe";
import { paidSession, startFake, type StartedFake } from "./test-support";

let started: StartedFake | undefined;
afterEach(async () => {
  await started?.fake.close();
  started = undefined;
});

describe("refunds", () => {
  it("refunds the full amount when no amount is given", async () => {
    started = await startFake();
    const { stripe } = started;
    const { paymentIntentId } = await paidSession(started, 2000);
    const refund = await stripe.refunds.create({ payment_intent: paymentIntentId, reason: "requested_by_customer" });
    expect(refund.id).toMatch(/^re_/);
    expect(refund).toMatchObject({ object: "refund", amount: 2000, currency: "eur", status: "succeeded", payment_intent: paymentIntentId, reason: "requested_by_customer" });

    const charge = await stripe.charges.retrieve(String(refund.charge));
    expect(charge).toMatchObject({ amount_refunded: 2000, refunded: true });
    expect(await stripe.refunds.retrieve(refund.id)).toEqual(refund);
  });

  it("refunds partially, then the rest, then refuses more", async () => {
    started = await startFake();
    const { stripe } = started;
    const { paymentIntentId } = await paidSession(started, 2000);
    const first = await stripe.refunds.create({ payment_intent: paymentIntentId, amount: 500 });
    expect(first.amount).toBe(500);
    let charge = await stripe.charges.retrieve(String(first.charge));
    expect(charge).toMatchObject({ amount_refunded: 500, refunded: false });

    const rest = await stripe.refunds.create({ charge: charge.id });
    expect(rest.amount).toBe(1500);
    charge = await stripe.charges.retrieve(charge.id);
    expect(charge).toMatchObject({ amount_refunded: 2000, refunded: true });

    const again = stripe.refunds.create({ payment_intent: paymentIntentId });
    await expect(again).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    await expect(again).rejects.toMatchObject({ statusCode: 400, code: "charge_already_refunded" });
  });

  it("refuses to refund more than is left, and changes nothing", async () => {
    started = await startFake();
    const { stripe } = started;
    const { paymentIntentId } = await paidSession(started, 2000);
    await stripe.refunds.create({ payment_intent: paymentIntentId, amount: 1200 });
    const over = stripe.refunds.create({ payment_intent: paymentIntentId, amount: 801 });
    await expect(over).rejects.toMatchObject({ type: "StripeInvalidRequestError", statusCode: 400, param: "amount" });
    const paymentIntent = await stripe.paymentIntents.retrieve(paymentIntentId, { expand: ["latest_charge"] });
    expect((paymentIntent.latest_charge as Stripe.Charge).amount_refunded).toBe(1200);
    // Exactly what is left still works.
    expect((await stripe.refunds.create({ payment_intent: paymentIntentId, amount: 800 })).amount).toBe(800);
  });

  it.each([
    [{ payment_intent: "pi_missing" }, 404, "payment_intent"],
    [{ charge: "ch_missing" }, 404, "charge"],
    [{}, 400, "payment_intent"],
  ] as [Stripe.RefundCreateParams, number, string][])("refuses %j with a Stripe-shaped error", async (params, status, param) => {
    started = await startFake();
    await expect(started.stripe.refunds.create(params)).rejects.toMatchObject({ statusCode: status, param });
  });

  it("refuses zero, negative and non-integer amounts", async () => {
    started = await startFake();
    const { stripe } = started;
    const { paymentIntentId } = await paidSession(started, 2000);
    for (const amount of [0, -5, 1.5]) {
      await expect(stripe.refunds.create({ payment_intent: paymentIntentId, amount })).rejects.toMatchObject({
        statusCode: 400,
        code: "parameter_invalid_integer",
        param: "amount",
      });
    }
    const charge = (await stripe.paymentIntents.retrieve(paymentIntentId, { expand: ["latest_charge"] })).latest_charge as Stripe.Charge;
    expect(charge.amount_refunded).toBe(0);
  });
});
