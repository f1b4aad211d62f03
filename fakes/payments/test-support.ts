// Shared helpers for the payments fake's tests: a started fake with a real stripe client,
// a local webhook receiver, and polling with a deadline (no fixed sleeps).
import { createServer, type IncomingHttpHeaders, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import Stripe from "stripe";
import { startPaymentsFake, type PaymentsFakeOptions, type RunningPaymentsFake } from "./server";
import type { ApiEvent, DeliveryAttempt, PendingDelivery } from "./types";

export const TEST_SECRET_KEY = "sk_test_gatecrash_fake_tests";
export const TEST_WEBHOOK_SECRET = "whsec_gatecrash_fake_tests_0123456789";

export function stripeClient(port: number, key = TEST_SECRET_KEY): Stripe {
  // No SDK retries: a failing request must fail the test, not be hidden by a retry.
  return new Stripe(key, { host: "127.0.0.1", port, protocol: "http", maxNetworkRetries: 0 });
}

export interface StartedFake {
  fake: RunningPaymentsFake;
  stripe: Stripe;
}

export async function startFake(options: Partial<PaymentsFakeOptions> = {}): Promise<StartedFake> {
  const fake = await startPaymentsFake({
    secretKey: TEST_SECRET_KEY,
    duplicateGapMs: 20,
    webhookRetryDelaysMs: [50, 100, 150],
    webhookTimeoutMs: 2_000,
    ...options,
  });
  return { fake, stripe: stripeClient(fake.port) };
}

export function temporaryFolder(): { path: string; remove(): void } {
  const path = mkdtempSync(join(tmpdir(), "gatecrash-payments-fake-"));
  return { path, remove: () => rmSync(path, { recursive: true, force: true }) };
}

export interface ReceivedWebhook {
  headers: IncomingHttpHeaders;
  body: string;
}

/** A webhook endpoint on 127.0.0.1 whose answer status tests can change, and which can go down and up. */
export class WebhookReceiver {
  readonly received: ReceivedWebhook[] = [];
  status = 200;
  port = 0;
  private server: Server | undefined;

  get url(): string {
    return `http://127.0.0.1:${this.port}/webhooks/payments`;
  }

  async listen(): Promise<void> {
    const server = createServer((request, response) => {
      const chunks: Buffer[] = [];
      request.on("data", (chunk: Buffer) => chunks.push(chunk));
      request.on("end", () => {
        this.received.push({ headers: request.headers, body: Buffer.concat(chunks).toString("utf8") });
        response.writeHead(this.status, { "Content-Type": "text/plain" }).end("noted");
      });
    });
    await new Promise<void>((resolve, reject) => {
      server.once("error", reject);
      server.listen(this.port, "127.0.0.1", () => resolve());
    });
    this.port = (server.address() as AddressInfo).port;
    this.server = server;
  }

  async close(): Promise<void> {
    const server = this.server;
    this.server = undefined;
    if (!server) return;
    await new Promise<void>((resolve) => {
      server.close(() => resolve());
      server.closeAllConnections();
    });
  }

  /** Deliveries of one event, verified with the stripe SDK (the independent reference for signatures). */
  verifiedEvents(stripe: Stripe, secret = TEST_WEBHOOK_SECRET): Stripe.Event[] {
    return this.received.map((delivery) =>
      stripe.webhooks.constructEvent(delivery.body, String(delivery.headers["stripe-signature"]), secret),
    );
  }
}

export async function waitFor<T>(what: string, probe: () => Promise<T | undefined> | T | undefined, timeoutMs = 10_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value !== undefined && value !== false) return value;
    if (Date.now() > deadline) throw new Error(`Timed out after ${timeoutMs} ms waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
}

export interface FakeEventLog {
  events: ApiEvent[];
  deliveries: DeliveryAttempt[];
  pending: PendingDelivery[];
  webhooks_enabled: boolean;
}

export async function eventLog(fake: RunningPaymentsFake, type?: string): Promise<FakeEventLog> {
  const query = type ? `?type=${encodeURIComponent(type)}` : "";
  const response = await fetch(`${fake.url}/_fake/events${query}`);
  if (response.status !== 200) throw new Error(`/_fake/events answered ${response.status}`);
  return (await response.json()) as FakeEventLog;
}

export async function createEntryFeeSession(
  stripe: Stripe,
  overrides: Partial<Stripe.Checkout.SessionCreateParams> = {},
): Promise<Stripe.Checkout.Session> {
  return stripe.checkout.sessions.create({
    mode: "payment",
    line_items: [{ quantity: 1, price_data: { currency: "eur", unit_amount: 1500, product_data: { name: "Entry fee: Beam Racers compo" } } }],
    success_url: "http://127.0.0.1:9/entries/e-17/paid?session={CHECKOUT_SESSION_ID}",
    cancel_url: "http://127.0.0.1:9/entries/e-17/pay",
    client_reference_id: "entry-e-17",
    metadata: { entryId: "e-17", crew: "demo-crew-lumen" },
    customer_email: "crew-lumen@example.test",
    ...overrides,
  });
}

/** Presses the hosted page's Pay (or Cancel) button the way a browser would: a form POST. */
export async function pressButton(fake: RunningPaymentsFake, sessionId: string, button: "pay" | "cancel"): Promise<Response> {
  return fetch(`${fake.url}/pay/${sessionId}/${button}`, {
    method: "POST",
    headers: { "Content-Type": "application/x-www-form-urlencoded" },
    body: "",
    redirect: "manual",
  });
}

export async function paidSession(started: StartedFake, amount = 1500): Promise<{ session: Stripe.Checkout.Session; paymentIntentId: string }> {
  const session = await createEntryFeeSession(started.stripe, {
    line_items: [{ quantity: 1, price_data: { currency: "eur", unit_amount: amount, product_data: { name: "Entry fee" } } }],
  });
  const response = await pressButton(started.fake, session.id, "pay");
  if (response.status !== 303) throw new Error(`Pay answered ${response.status}`);
  const paid = await started.stripe.checkout.sessions.retrieve(session.id);
  return { session: paid, paymentIntentId: String(paid.payment_intent) };
}
