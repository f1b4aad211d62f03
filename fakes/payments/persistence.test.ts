// State in PAYMENTS_FAKE_DATA_DIR survives a restart: objects, events, idempotency keys
// and deliveries still waiting for their next attempt.
import { afterEach, describe, expect, it } from "vitest";
import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { STATE_FILE_NAME } from "./store";
import { startPaymentsFake } from "./server";
import {
  TEST_SECRET_KEY,
  TEST_WEBHOOK_SECRET,
  WebhookReceiver,
  createEntryFeeSession,
  eventLog,
  paidSession,
  startFake,
  temporaryFolder,
  waitFor,
  type StartedFake,
} from "./test-support";

const cleanups: (() => Promise<void> | void)[] = [];
afterEach(async () => {
  for (const cleanup of cleanups.splice(0).reverse()) await cleanup();
});

async function startTracked(options: Parameters<typeof startFake>[0]): Promise<StartedFake> {
  const started = await startFake(options);
  cleanups.push(() => started.fake.close());
  return started;
}

describe("persistence", () => {
  it("keeps sessions, payments, refunds, events and idempotency keys across a restart", async () => {
    const folder = temporaryFolder();
    cleanups.push(folder.remove);
    const before = await startTracked({ dataDir: folder.path });
    const { session, paymentIntentId } = await paidSession(before, 3000);
    const open = await createEntryFeeSession(before.stripe);
    const refund = await before.stripe.refunds.create({ payment_intent: paymentIntentId, amount: 1000 }, { idempotencyKey: "refund-persist" });
    const eventsBefore = (await eventLog(before.fake)).events.map((event) => event.id);
    await before.fake.close();

    const after = await startTracked({ dataDir: folder.path });
    const session2 = await after.stripe.checkout.sessions.retrieve(session.id);
    expect(session2).toMatchObject({ status: "complete", payment_status: "paid", payment_intent: paymentIntentId });
    // The hosted page URL follows the fake's current address.
    expect((await after.stripe.checkout.sessions.retrieve(open.id)).url).toBe(`${after.fake.url}/pay/${open.id}`);
    expect(await after.stripe.refunds.retrieve(refund.id)).toEqual(refund);
    expect((await eventLog(after.fake)).events.map((event) => event.id)).toEqual(eventsBefore);

    const replay = await after.stripe.refunds.create({ payment_intent: paymentIntentId, amount: 1000 }, { idempotencyKey: "refund-persist" });
    expect(replay.id).toBe(refund.id);
    await expect(after.stripe.refunds.create({ payment_intent: paymentIntentId, amount: 2001 })).rejects.toMatchObject({ statusCode: 400, param: "amount" });
    expect((await after.stripe.refunds.create({ payment_intent: paymentIntentId })).amount).toBe(2000);
  });

  it("resumes a delivery that was still waiting for a retry when the fake stopped", async () => {
    const folder = temporaryFolder();
    cleanups.push(folder.remove);
    const receiver = new WebhookReceiver();
    await receiver.listen();
    const port = receiver.port;
    await receiver.close();
    const options = { dataDir: folder.path, webhookUrl: receiver.url, webhookSecret: TEST_WEBHOOK_SECRET, webhookCopies: 1, webhookRetryDelaysMs: [200, 200, 200] };

    const before = await startTracked(options);
    const session = await createEntryFeeSession(before.stripe);
    await before.stripe.checkout.sessions.expire(session.id);
    await waitFor("a failed first attempt", async () => (await eventLog(before.fake)).deliveries[0]);
    await before.fake.close();

    receiver.port = port;
    await receiver.listen();
    cleanups.push(() => receiver.close());
    const after = await startTracked(options);
    const delivered = await waitFor("the resumed delivery", () => receiver.received[0]);
    const event = after.stripe.webhooks.constructEvent(delivered.body, String(delivered.headers["stripe-signature"]), TEST_WEBHOOK_SECRET);
    expect(event.type).toBe("checkout.session.expired");
    const log = await waitFor("a settled log", async () => {
      const current = await eventLog(after.fake);
      return current.pending.length === 0 ? current : undefined;
    });
    expect(log.deliveries.map((d) => [d.attempt, d.succeeded])).toEqual([
      [1, false],
      [2, true],
    ]);
  });

  it("refuses to start on a damaged state file instead of discarding it", async () => {
    const folder = temporaryFolder();
    cleanups.push(folder.remove);
    writeFileSync(join(folder.path, STATE_FILE_NAME), "{ not json");
    await expect(startPaymentsFake({ secretKey: TEST_SECRET_KEY, dataDir: folder.path })).rejects.toThrow(/not valid JSON/);
  });
});
