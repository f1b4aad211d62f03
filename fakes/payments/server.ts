// The local payments fake: a Stripe-compatible subset for the entry-fee flow, served on
// 127.0.0.1. Start it with `tsx fakes/payments/server.ts` (settings from the environment,
// see config.ts) or from tests with startPaymentsFake().
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import type { AddressInfo } from "node:net";
import { pathToFileURL } from "node:url";
import { createApiHandler } from "./api-routes";
import { optionsFromEnvironment, type PaymentsFakeOptions } from "./config";
import { ApiError } from "./errors";
import { EventLog } from "./events";
import { sendJson } from "./http";
import { IdempotencyCache } from "./idempotency";
import { createInspectHandler } from "./inspect-routes";
import { Ledger } from "./ledger";
import { createPayHandler } from "./pay-routes";
import { Store } from "./store";
import { WebhookDispatcher } from "./webhooks";

export type { PaymentsFakeOptions } from "./config";

export interface RunningPaymentsFake {
  url: string;
  port: number;
  close(): Promise<void>;
}

const HOST = "127.0.0.1";
// The API version the installed stripe SDK (23.1.0) pins; events carry it in `api_version`.
export const DEFAULT_API_VERSION = "2026-10-28.endive";
const EXPIRY_SWEEP_MS = 1000;

export async function startPaymentsFake(options: PaymentsFakeOptions): Promise<RunningPaymentsFake> {
  if (!options.secretKey) throw new Error("startPaymentsFake needs a secretKey (the API key clients must send).");
  if (options.webhookUrl && !options.webhookSecret) {
    throw new Error("startPaymentsFake: a webhookUrl needs a webhookSecret (whsec_…) to sign deliveries.");
  }
  const store = Store.open(options.dataDir);
  const nowSeconds = (): number => Math.floor((options.now ?? Date.now)() / 1000);
  const dispatcher = new WebhookDispatcher(store, {
    url: options.webhookUrl || undefined,
    secret: options.webhookSecret || undefined,
    copies: Math.max(1, options.webhookCopies ?? 2),
    duplicateGapMs: options.duplicateGapMs ?? 500,
    retryDelaysMs: options.webhookRetryDelaysMs ?? [1_000, 5_000, 30_000, 120_000],
    timeoutMs: options.webhookTimeoutMs ?? 10_000,
  });
  const events = new EventLog(store, dispatcher, options.apiVersion ?? DEFAULT_API_VERSION, nowSeconds);

  const server = createServer();
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port ?? 0, HOST, () => {
      server.off("error", reject);
      resolve();
    });
  });
  const port = (server.address() as AddressInfo).port;
  const url = `http://${HOST}:${port}`;
  const ledger = new Ledger(store, events, options.publicUrl || url, nowSeconds);
  const handleApi = createApiHandler({ ledger, events, idempotency: new IdempotencyCache(store), secretKey: options.secretKey });
  const handlePay = createPayHandler(ledger);
  const handleInspect = createInspectHandler(store, events, dispatcher);

  async function handle(request: IncomingMessage, response: ServerResponse): Promise<void> {
    const requestUrl = new URL(request.url ?? "/", url);
    try {
      ledger.expireOverdueSessions();
      const path = requestUrl.pathname;
      if (path.startsWith("/v1/")) return await handleApi(request, response, requestUrl);
      if (path.startsWith("/pay/")) return await handlePay(request, response, requestUrl);
      if (path.startsWith("/_fake/")) return await handleInspect(request, response, requestUrl);
      throw new ApiError(404, "invalid_request_error", `Unrecognized request URL (${request.method}: ${path}).`);
    } catch (error) {
      const apiError =
        error instanceof ApiError
          ? error
          : (console.error("payments fake: unexpected failure", error), new ApiError(500, "api_error", "The local payments fake failed unexpectedly."));
      if (!response.headersSent) sendJson(response, apiError.status, JSON.stringify(apiError.toBody(), null, 2));
      else response.destroy();
    }
  }
  server.on("request", (request, response) => void handle(request, response));

  dispatcher.resume();
  const sweep = setInterval(() => ledger.expireOverdueSessions(), EXPIRY_SWEEP_MS);
  sweep.unref();

  let closing: Promise<void> | undefined;
  return {
    url,
    port,
    close() {
      closing ??= (async () => {
        clearInterval(sweep);
        await dispatcher.stop();
        await new Promise<void>((resolve) => {
          server.close(() => resolve());
          server.closeAllConnections();
        });
        store.save();
      })();
      return closing;
    },
  };
}

async function main(): Promise<void> {
  const options = optionsFromEnvironment(process.env);
  const fake = await startPaymentsFake(options);
  console.log(`Gatecrash payments fake listening on ${fake.url}` + (options.webhookUrl ? `, webhooks to ${options.webhookUrl}` : ", webhooks off"));
  const stop = (): void => {
    void fake.close().then(() => process.exit(0));
  };
  process.once("SIGINT", stop);
  process.once("SIGTERM", stop);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  main().catch((error: unknown) => {
    console.error(`payments fake: ${(error as Error).message}`);
    process.exit(1);
  });
}
