// Test-only introspection under /_fake: the event log with every delivery attempt, and resends.
import type { IncomingMessage, ServerResponse } from "node:http";
import { ApiError, resourceMissing } from "./errors";
import type { EventLog } from "./events";
import { readBody, sendJson } from "./http";
import type { Store } from "./store";
import type { WebhookDispatcher } from "./webhooks";

const RESEND_PATH = /^\/_fake\/events\/([^/]+)\/resend$/;

export function createInspectHandler(store: Store, events: EventLog, dispatcher: WebhookDispatcher) {
  return async function handleInspect(request: IncomingMessage, response: ServerResponse, url: URL): Promise<void> {
    const method = request.method ?? "GET";
    try {
      if (method === "GET" && url.pathname === "/_fake/events") {
        const type = url.searchParams.get("type");
        const list = Object.keys(store.state.events)
          .map((id) => events.retrieve(id))
          .filter((event) => event !== undefined && (type === null || event.type === type));
        const ids = new Set(list.map((event) => event?.id));
        const deliveries = store.state.deliveries.filter((delivery) => ids.has(delivery.event_id));
        const pending = store.state.pendingDeliveries.filter((item) => ids.has(item.event_id));
        sendJson(response, 200, JSON.stringify({ events: list, deliveries, pending, webhooks_enabled: dispatcher.enabled }, null, 2));
        return;
      }
      const resend = RESEND_PATH.exec(url.pathname);
      if (method === "POST" && resend) {
        await readBody(request);
        const eventId = resend[1];
        if (!store.state.events[eventId]) throw resourceMissing("event", eventId);
        const copy = dispatcher.resend(eventId);
        if (copy === null) {
          throw new ApiError(409, "invalid_request_error", "Webhooks are off: set PAYMENTS_FAKE_WEBHOOK_URL and PAYMENTS_FAKE_WEBHOOK_SECRET.");
        }
        sendJson(response, 202, JSON.stringify({ event_id: eventId, copy }, null, 2));
        return;
      }
      throw new ApiError(404, "invalid_request_error", `Unrecognized request URL (${method}: ${url.pathname}).`);
    } catch (error) {
      if (!(error instanceof ApiError)) throw error;
      sendJson(response, error.status, JSON.stringify(error.toBody(), null, 2));
    }
  };
}
