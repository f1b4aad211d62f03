// Shapes of the objects the fake stores and serves. Field names follow the Stripe API
// reference for the subset an entry-fee flow reads.

export type Metadata = Record<string, string>;

export interface CheckoutLineItem {
  id: string;
  name: string;
  currency: string;
  unit_amount: number;
  quantity: number;
}

/** Stored form of a Checkout Session; `url` is derived on output from the fake's public URL. */
export interface StoredCheckoutSession {
  id: string;
  object: "checkout.session";
  amount_subtotal: number;
  amount_total: number;
  cancel_url: string | null;
  client_reference_id: string | null;
  created: number;
  currency: string;
  customer: null;
  customer_details: { email: string | null } | null;
  customer_email: string | null;
  expires_at: number;
  livemode: false;
  metadata: Metadata;
  mode: "payment";
  payment_intent: string | null;
  payment_method_types: string[];
  payment_status: "paid" | "unpaid";
  status: "complete" | "expired" | "open";
  success_url: string;
  total_details: { amount_discount: number; amount_shipping: number; amount_tax: number };
  line_items_internal: CheckoutLineItem[];
  payment_intent_metadata: Metadata;
}

export type CheckoutSession = Omit<StoredCheckoutSession, "line_items_internal" | "payment_intent_metadata"> & {
  url: string | null;
};

export interface PaymentIntent {
  id: string;
  object: "payment_intent";
  amount: number;
  amount_received: number;
  currency: string;
  created: number;
  latest_charge: string;
  livemode: false;
  metadata: Metadata;
  payment_method_types: string[];
  receipt_email: string | null;
  status: "succeeded";
}

export interface Charge {
  id: string;
  object: "charge";
  amount: number;
  amount_captured: number;
  amount_refunded: number;
  captured: true;
  created: number;
  currency: string;
  livemode: false;
  metadata: Metadata;
  paid: true;
  payment_intent: string;
  receipt_email: string | null;
  refunded: boolean;
  status: "succeeded";
}

export type RefundReason = "duplicate" | "fraudulent" | "requested_by_customer";

export interface Refund {
  id: string;
  object: "refund";
  amount: number;
  charge: string;
  created: number;
  currency: string;
  metadata: Metadata;
  payment_intent: string;
  reason: RefundReason | null;
  status: "succeeded";
}

export type ApiObject = CheckoutSession | PaymentIntent | Charge | Refund;

export interface ApiEvent {
  id: string;
  object: "event";
  api_version: string;
  created: number;
  data: { object: ApiObject; previous_attributes?: Record<string, unknown> };
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
  type: string;
}

/** One HTTP attempt to hand an event to the webhook receiver. */
export interface DeliveryAttempt {
  id: string;
  event_id: string;
  event_type: string;
  /** Which of the deliberate duplicate deliveries (1, 2, …) or a resend this attempt belongs to. */
  copy: number;
  attempt: number;
  attempted_at: number;
  url: string;
  status_code: number | null;
  error: string | null;
  succeeded: boolean;
  /** When the next attempt of this copy is due (ms since epoch), or null if none follows. */
  next_attempt_at: number | null;
}

/** A delivery chain still waiting for its next attempt; persisted so a restart resumes it. */
export interface PendingDelivery {
  event_id: string;
  copy: number;
  attempt: number;
  due_at: number;
}

export interface IdempotencyRecord {
  fingerprint: string;
  status: number;
  body: string;
  created: number;
}
