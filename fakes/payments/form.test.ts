// The form parser, checked against bodies the real stripe SDK encodes, plus hostile input.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import Stripe from "stripe";
import { ApiError } from "./errors";
import { parseFormBody } from "./form";
import { stripeClient } from "./test-support";

/** What the SDK's values become on the wire: every leaf a string. */
function asWireStrings(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(asWireStrings);
  if (value !== null && typeof value === "object") {
    return Object.fromEntries(Object.entries(value).map(([key, inner]) => [key, asWireStrings(inner)]));
  }
  return String(value);
}

describe("parseFormBody against the stripe SDK's own encoding", () => {
  let server: Server;
  let stripe: Stripe;
  const bodies: string[] = [];

  beforeAll(async () => {
    // A stand-in endpoint that only records what the SDK sends.
    server = createServer((request, response) => {
      const chunks: Buffer[] = [];
      request.on("data", (chunk: Buffer) => chunks.push(chunk));
      request.on("end", () => {
        bodies.push(Buffer.concat(chunks).toString("utf8"));
        response.writeHead(200, { "Content-Type": "application/json" }).end('{"id":"cs_test_recorded","object":"checkout.session"}');
      });
    });
    await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", () => resolve()));
    stripe = stripeClient((server.address() as AddressInfo).port);
  });

  afterAll(async () => {
    await new Promise<void>((resolve) => {
      server.close(() => resolve());
      server.closeAllConnections();
    });
  });

  it("recovers nested line items, metadata and lists exactly", async () => {
    const params = {
      mode: "payment" as const,
      line_items: [
        { quantity: 2, price_data: { currency: "eur", unit_amount: 1250, product_data: { name: "Entry fee & späti [crew]" } } },
        { quantity: 1, price_data: { currency: "eur", unit_amount: 0, product_data: { name: "Sticker = free" } } },
      ],
      success_url: "https://gatecrash.test/paid?session={CHECKOUT_SESSION_ID}&x=1",
      metadata: { entryId: "e-17", note: "100% +tabs\tand spaces" },
      payment_method_types: ["card" as const],
      expand: ["payment_intent"],
    };
    await stripe.checkout.sessions.create(params);
    expect(parseFormBody(bodies.at(-1) as string)).toEqual(asWireStrings(params));
  });

  it("keeps a long list a list (qs turns indices over its default arrayLimit of 20 into object keys)", async () => {
    const params = {
      mode: "payment" as const,
      line_items: Array.from({ length: 25 }, (_, i) => ({ quantity: 1, price_data: { currency: "eur", unit_amount: 100 + i, product_data: { name: `Sticker ${i}` } } })),
      success_url: "https://gatecrash.test/paid",
    };
    await stripe.checkout.sessions.create(params);
    const parsed = parseFormBody(bodies.at(-1) as string);
    expect(Array.isArray(parsed.line_items)).toBe(true);
    expect(parsed).toEqual(asWireStrings(params));
  });
});

describe("parseFormBody on its own", () => {
  it("reads `[]` appends and percent-encoded brackets", () => {
    expect(parseFormBody("expand[]=a&expand[]=b&metadata%5Bk%5D=v+w")).toEqual({ expand: ["a", "b"], metadata: { k: "v w" } });
  });

  it("reads a query string the same way", async () => {
    const { parseFormQuery } = await import("./form");
    expect(parseFormQuery("?expand[]=payment_intent&limit=3")).toEqual({ expand: ["payment_intent"], limit: "3" });
  });

  it("orders array elements by index", () => {
    expect(parseFormBody("items[1][n]=second&items[0][n]=first")).toEqual({ items: [{ n: "first" }, { n: "second" }] });
  });

  it.each([
    ["a[b=1", "a[b"],
    ["a=1&a[b]=2", "a[b]"],
    ["a[b]=2&a=1", "a"],
    ["__proto__[polluted]=1", "__proto__[polluted]"],
    ["a[constructor]=1", "a[constructor]"],
    ["a[][b]=1", "a[][b]"],
    ["a[1][2][3][4][5][6][7][8]=1", "a[1][2][3][4][5][6][7][8]"],
  ])("refuses %s with a 400 naming the parameter", (body, param) => {
    let caught: unknown;
    try {
      parseFormBody(body);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(ApiError);
    expect((caught as ApiError).toBody()).toMatchObject({ error: { type: "invalid_request_error", param } });
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });

  it("refuses more than 2000 pairs", () => {
    const body = Array.from({ length: 2001 }, (_, index) => `k${index}=v`).join("&");
    expect(() => parseFormBody(body)).toThrow(ApiError);
  });
});
