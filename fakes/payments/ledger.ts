// The payment state machine: Checkout Sessions, the payment intent and charge a paid
// session creates, and refunds against that charge. Every change emits its events.
import { ApiError, invalidParam, invalidRequest, resourceMissing } from "./errors";
import type { EventLog, RequestOrigin } from "./events";
import { newId } from "./ids";
import type { Params } from "./params";
import type { Store } from "./store";
import type {
  Charge,
  CheckoutLineItem,
  CheckoutSession,
  PaymentIntent,
  Refund,
  RefundReason,
  StoredCheckoutSession,
} from "./types";

// Stripe's largest amount for most currencies (99,999,999 minor units).
const MAX_AMOUNT = 99_999_999;
const MAX_QUANTITY = 999_999;
const MIN_LIFETIME_SECONDS = 30 * 60;
const MAX_LIFETIME_SECONDS = 24 * 60 * 60;
const REFUND_REASONS: readonly RefundReason[] = ["duplicate", "fraudulent", "requested_by_customer"];
const EMAIL_SHAPE = /^[^\s@]+@[^\s@]+$/;

export class Ledger {
  private readonly store: Store;
  private readonly events: EventLog;
  private readonly publicUrl: string;
  private readonly nowSeconds: () => number;

  constructor(store: Store, events: EventLog, publicUrl: string, nowSeconds: () => number) {
    this.store = store;
    this.events = events;
    this.publicUrl = publicUrl.replace(/\/+$/, "");
    this.nowSeconds = nowSeconds;
  }

  hostedPageUrl(sessionId: string): string {
    return `${this.publicUrl}/pay/${sessionId}`;
  }

  present(session: StoredCheckoutSession): CheckoutSession {
    const { line_items_internal: _lineItems, payment_intent_metadata: _piMetadata, ...visible } = session;
    return { ...visible, url: session.status === "open" ? this.hostedPageUrl(session.id) : null };
  }

  createCheckoutSession(params: Params): CheckoutSession {
    params.rejectUnknown([
      "mode",
      "line_items",
      "success_url",
      "cancel_url",
      "client_reference_id",
      "metadata",
      "customer_email",
      "expires_at",
      "payment_method_types",
      "payment_intent_data",
    ]);
    const mode = params.optionalEnum("mode", ["payment", "setup", "subscription"]);
    if (mode === undefined) throw invalidRequest("Missing required param: mode.", { code: "parameter_missing", param: "mode" });
    if (mode !== "payment") throw invalidParam("mode", "The local payments fake supports only mode=payment.");

    const lineItems = this.readLineItems(params);
    const currency = lineItems[0].currency;
    const mismatch = lineItems.findIndex((item) => item.currency !== currency);
    if (mismatch >= 0) {
      throw invalidParam(`line_items[${mismatch}][price_data][currency]`, "All line items must use the same currency.");
    }
    const amountTotal = lineItems.reduce((sum, item) => sum + item.unit_amount * item.quantity, 0);
    if (amountTotal > MAX_AMOUNT) {
      throw invalidParam("line_items", `The total amount must be at most ${MAX_AMOUNT} (in the smallest currency unit).`, "amount_too_large");
    }

    const successUrl = params.optionalUrl("success_url");
    if (successUrl === undefined) throw invalidRequest("Missing required param: success_url.", { code: "parameter_missing", param: "success_url" });
    const cancelUrl = params.optionalUrl("cancel_url") ?? null;
    const customerEmail = params.optionalString("customer_email", 800) ?? null;
    if (customerEmail !== null && !EMAIL_SHAPE.test(customerEmail)) {
      throw invalidParam("customer_email", `Invalid email address: ${customerEmail}`, "email_invalid");
    }
    const paymentMethodTypes = params.optionalStringArray("payment_method_types");
    const unsupportedMethod = paymentMethodTypes.findIndex((type) => type !== "card");
    if (unsupportedMethod >= 0) {
      throw invalidParam(`payment_method_types[${unsupportedMethod}]`, "The local payments fake supports only the card payment method type.");
    }
    const paymentIntentData = params.optionalObject("payment_intent_data");
    paymentIntentData?.rejectUnknown(["metadata"]);

    const created = this.nowSeconds();
    const expiresAt = params.optionalInteger("expires_at", {
      min: created + MIN_LIFETIME_SECONDS,
      max: created + MAX_LIFETIME_SECONDS,
    });

    const session: StoredCheckoutSession = {
      id: newId("cs_test", 56),
      object: "checkout.session",
      amount_subtotal: amountTotal,
      amount_total: amountTotal,
      cancel_url: cancelUrl,
      client_reference_id: params.optionalString("client_reference_id", 200) ?? null,
      created,
      currency,
      customer: null,
      customer_details: null,
      customer_email: customerEmail,
      expires_at: expiresAt ?? created + MAX_LIFETIME_SECONDS,
      livemode: false,
      metadata: params.metadata(),
      mode: "payment",
      payment_intent: null,
      payment_method_types: ["card"],
      payment_status: "unpaid",
      status: "open",
      success_url: successUrl,
      total_details: { amount_discount: 0, amount_shipping: 0, amount_tax: 0 },
      line_items_internal: lineItems,
      payment_intent_metadata: paymentIntentData?.metadata() ?? {},
    };
    this.store.state.sessions[session.id] = session;
    this.store.save();
    return this.present(session);
  }

  private readLineItems(params: Params): CheckoutLineItem[] {
    const items = params.requiredObjectArray("line_items");
    if (items.length === 0) throw invalidParam("line_items", "line_items must contain at least one item.");
    return items.map((item) => {
      item.rejectUnknown(["price_data", "quantity"]);
      const priceData = item.requiredObject("price_data");
      priceData.rejectUnknown(["currency", "unit_amount", "product_data"]);
      const currency = priceData.requiredString("currency", 3).toLowerCase();
      if (!/^[a-z]{3}$/.test(currency)) {
        throw invalidParam(priceData.path("currency"), `Invalid currency: ${currency}. Use a three-letter ISO 4217 code.`);
      }
      const productData = priceData.requiredObject("product_data");
      productData.rejectUnknown(["name", "description"]);
      return {
        id: newId("li"),
        name: productData.requiredString("name", 250),
        currency,
        unit_amount: priceData.requiredInteger("unit_amount", { min: 0, max: MAX_AMOUNT }),
        quantity: item.requiredInteger("quantity", { min: 1, max: MAX_QUANTITY }),
      };
    });
  }

  storedSession(id: string): StoredCheckoutSession {
    const session = this.store.state.sessions[id];
    if (!session) throw resourceMissing("checkout.session", id);
    return session;
  }

  retrieveSession(id: string): CheckoutSession {
    return this.present(this.storedSession(id));
  }

  expireSession(id: string, origin: RequestOrigin): CheckoutSession {
    const session = this.storedSession(id);
    if (session.status !== "open") {
      throw invalidRequest(
        `Only Checkout Sessions with status "open" can be expired; this one has status "${session.status}".`,
        { code: "checkout_session_not_open" },
      );
    }
    this.markExpired(session, origin);
    this.store.save();
    return this.present(session);
  }

  /** Expires open sessions whose `expires_at` has passed, as the real service does by itself. */
  expireOverdueSessions(): void {
    const now = this.nowSeconds();
    let changed = false;
    for (const session of Object.values(this.store.state.sessions)) {
      if (session.status === "open" && session.expires_at <= now) {
        this.markExpired(session, { requestId: null, idempotencyKey: null });
        changed = true;
      }
    }
    if (changed) this.store.save();
  }

  private markExpired(session: StoredCheckoutSession, origin: RequestOrigin): void {
    session.status = "expired";
    this.events.emit("checkout.session.expired", this.present(session), origin);
  }

  /** The hosted page's Pay button. Paying twice is harmless: the second time changes nothing. */
  paySession(id: string, origin: RequestOrigin): StoredCheckoutSession {
    const session = this.storedSession(id);
    if (session.status === "complete") return session;
    if (session.status === "expired") {
      throw new ApiError(409, "invalid_request_error", "This Checkout Session has expired and can no longer be paid.", {
        code: "checkout_session_expired",
      });
    }
    const created = this.nowSeconds();
    const paymentIntentId = newId("pi");
    const charge: Charge = {
      id: newId("ch"),
      object: "charge",
      amount: session.amount_total,
      amount_captured: session.amount_total,
      amount_refunded: 0,
      captured: true,
      created,
      currency: session.currency,
      livemode: false,
      metadata: { ...session.payment_intent_metadata },
      paid: true,
      payment_intent: paymentIntentId,
      receipt_email: session.customer_email,
      refunded: false,
      status: "succeeded",
    };
    const paymentIntent: PaymentIntent = {
      id: paymentIntentId,
      object: "payment_intent",
      amount: session.amount_total,
      amount_received: session.amount_total,
      currency: session.currency,
      created,
      latest_charge: charge.id,
      livemode: false,
      metadata: { ...session.payment_intent_metadata },
      payment_method_types: ["card"],
      receipt_email: session.customer_email,
      status: "succeeded",
    };
    this.store.state.charges[charge.id] = charge;
    this.store.state.paymentIntents[paymentIntent.id] = paymentIntent;
    session.status = "complete";
    session.payment_status = "paid";
    session.payment_intent = paymentIntent.id;
    session.customer_details = { email: session.customer_email };
    this.events.emit("charge.succeeded", charge, origin);
    this.events.emit("payment_intent.succeeded", paymentIntent, origin);
    this.events.emit("checkout.session.completed", this.present(session), origin);
    this.store.save();
    return session;
  }

  retrievePaymentIntent(id: string): PaymentIntent {
    const paymentIntent = this.store.state.paymentIntents[id];
    if (!paymentIntent) throw resourceMissing("payment_intent", id);
    return paymentIntent;
  }

  retrieveCharge(id: string): Charge {
    const charge = this.store.state.charges[id];
    if (!charge) throw resourceMissing("charge", id);
    return charge;
  }

  retrieveRefund(id: string): Refund {
    const refund = this.store.state.refunds[id];
    if (!refund) throw resourceMissing("refund", id);
    return refund;
  }

  createRefund(params: Params, origin: RequestOrigin): Refund {
    params.rejectUnknown(["payment_intent", "charge", "amount", "reason", "metadata"]);
    const charge = this.chargeToRefund(params);
    const remaining = charge.amount - charge.amount_refunded;
    if (remaining <= 0) {
      throw invalidRequest(`Charge ${charge.id} has already been refunded.`, { code: "charge_already_refunded" });
    }
    const amount = params.optionalInteger("amount", { min: 1, max: MAX_AMOUNT }) ?? remaining;
    if (amount > remaining) {
      throw invalidParam(
        "amount",
        `Refund amount (${amount}) is greater than the unrefunded amount on charge ${charge.id} (${remaining}), in the smallest ${charge.currency} unit.`,
        "refund_amount_too_large",
      );
    }
    const refund: Refund = {
      id: newId("re"),
      object: "refund",
      amount,
      charge: charge.id,
      created: this.nowSeconds(),
      currency: charge.currency,
      metadata: params.metadata(),
      payment_intent: charge.payment_intent,
      reason: params.optionalEnum("reason", REFUND_REASONS) ?? null,
      status: "succeeded",
    };
    const previous = { amount_refunded: charge.amount_refunded, refunded: charge.refunded };
    charge.amount_refunded += amount;
    charge.refunded = charge.amount_refunded === charge.amount;
    this.store.state.refunds[refund.id] = refund;
    this.events.emit("refund.created", refund, origin);
    this.events.emit("charge.refunded", charge, origin, previous);
    this.store.save();
    return refund;
  }

  private chargeToRefund(params: Params): Charge {
    const paymentIntentId = params.optionalString("payment_intent", 255);
    const chargeId = params.optionalString("charge", 255);
    if (paymentIntentId === undefined && chargeId === undefined) {
      throw invalidRequest("One of the parameters payment_intent or charge is required.", { code: "parameter_missing", param: "payment_intent" });
    }
    if (chargeId !== undefined) {
      const charge = this.store.state.charges[chargeId];
      if (!charge) throw resourceMissing("charge", chargeId, "charge");
      if (paymentIntentId !== undefined && charge.payment_intent !== paymentIntentId) {
        throw invalidParam("charge", `Charge ${chargeId} does not belong to payment intent ${paymentIntentId}.`);
      }
      return charge;
    }
    const paymentIntent = this.store.state.paymentIntents[paymentIntentId as string];
    if (!paymentIntent) throw resourceMissing("payment_intent", paymentIntentId as string, "payment_intent");
    return this.store.state.charges[paymentIntent.latest_charge] as Charge;
  }
}
