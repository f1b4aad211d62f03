import { describe, expect, it } from "vitest";
import { applyEvidence, feeStateOf, formatMoney, type Evidence, type PaymentSnapshot } from "./states";

const open: PaymentSnapshot = { state: "open", amount: 1500, refundedAmount: 0, paymentIntentId: null };
const run = (evs: Evidence[]) => evs.reduce(applyEvidence, open);

describe("payment states under any event order", () => {
  const paid: Evidence = { kind: "paid", paymentIntentId: "pi_1" };
  const refunded: Evidence = { kind: "refunded", paymentIntentId: "pi_1", refundedTotal: 1500 };
  it("pays, then refunds", () => {
    expect(run([paid, refunded])).toMatchObject({ state: "refunded", refundedAmount: 1500, paymentIntentId: "pi_1" });
  });
  it("never moves a refund back to paid when the paid event arrives last", () => {
    expect(run([refunded, paid])).toMatchObject({ state: "refunded", refundedAmount: 1500 });
  });
  it("never undoes a payment with a late expiry", () => {
    expect(run([paid, { kind: "expired" }]).state).toBe("paid");
    expect(run([{ kind: "expired" }, paid]).state).toBe("paid");
  });
  it("keeps the largest cumulative refund and tells partial from full", () => {
    const half: Evidence = { kind: "refunded", paymentIntentId: "pi_1", refundedTotal: 500 };
    expect(run([paid, half]).state).toBe("partially_refunded");
    expect(run([paid, refunded, half])).toMatchObject({ state: "refunded", refundedAmount: 1500 });
  });
  it("is unchanged by a repeat", () => {
    expect(run([paid, paid, refunded, refunded])).toEqual(run([paid, refunded]));
  });
});

describe("fee state of an entry", () => {
  it("follows its payments", () => {
    expect(feeStateOf(0, [])).toBe("not_required");
    expect(feeStateOf(1500, [])).toBe("unpaid");
    expect(feeStateOf(1500, [{ state: "open" }])).toBe("pending");
    expect(feeStateOf(1500, [{ state: "expired" }, { state: "paid" }])).toBe("paid");
    expect(feeStateOf(1500, [{ state: "refunded" }, { state: "expired" }])).toBe("refunded");
    expect(feeStateOf(1500, [{ state: "expired" }])).toBe("unpaid");
  });
  it("formats minor units per currency (ISO 4217 minor units via Intl)", () => {
    expect(formatMoney(1500, "eur")).toBe("€15.00");
    expect(formatMoney(500, "jpy")).toBe("JP¥500");
  });
});
