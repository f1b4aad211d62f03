/**
 * How a fee payment moves, whatever order the payment service's events arrive in. Each event is evidence
 * ("it was paid", "this much was refunded", "the checkout expired"); the state only ever moves forward:
 * open → expired, open/expired → paid → partially_refunded → refunded. A late "paid" never undoes a refund, and an
 * "expired" never undoes a payment.
 */
export type PaymentState = "open" | "expired" | "paid" | "partially_refunded" | "refunded";
export type FeeState = "not_required" | "unpaid" | "pending" | "paid" | "refunded";

export interface PaymentSnapshot {
  state: PaymentState;
  amount: number;
  refundedAmount: number;
  paymentIntentId: string | null;
}

export type Evidence =
  | { kind: "paid"; paymentIntentId: string | null }
  | { kind: "refunded"; paymentIntentId: string | null; refundedTotal: number }
  | { kind: "expired" };

export function applyEvidence(p: PaymentSnapshot, e: Evidence): PaymentSnapshot {
  const paymentIntentId = p.paymentIntentId ?? ("paymentIntentId" in e ? e.paymentIntentId : null);
  switch (e.kind) {
    case "expired":
      return p.state === "open" ? { ...p, state: "expired" } : p;
    case "paid":
      return p.state === "open" || p.state === "expired" ? { ...p, state: "paid", paymentIntentId } : { ...p, paymentIntentId };
    case "refunded": {
      // Refund totals are cumulative on the charge: keep the largest seen, so an older event cannot lower it.
      const refundedAmount = Math.min(p.amount, Math.max(p.refundedAmount, e.refundedTotal));
      const state: PaymentState = refundedAmount >= p.amount ? "refunded" : refundedAmount > 0 ? "partially_refunded" : p.state;
      return { ...p, state, refundedAmount, paymentIntentId };
    }
  }
}

/** The entry's fee state from all its payments (one entry may have several checkouts; one paid is enough). */
export function feeStateOf(feeAmount: number, payments: Pick<PaymentSnapshot, "state">[]): FeeState {
  if (feeAmount === 0) return "not_required";
  const states = payments.map((p) => p.state);
  if (states.includes("paid") || states.includes("partially_refunded")) return "paid";
  if (states.includes("refunded")) return "refunded";
  if (states.includes("open")) return "pending";
  return "unpaid";
}

export function formatMoney(minor: number, currency: string): string {
  const f = new Intl.NumberFormat("en-GB", { style: "currency", currency: currency.toUpperCase() });
  const digits = f.resolvedOptions().maximumFractionDigits ?? 2;
  return f.format(minor / 10 ** digits);
}
