// Records an event for every state change and hands it to the webhook dispatcher.
import { newId } from "./ids";
import type { Store } from "./store";
import type { ApiEvent, ApiObject } from "./types";
import type { WebhookDispatcher } from "./webhooks";

/** Event types this fake emits; see README.md for when each one fires. */
export const EVENT_TYPES = [
  "charge.succeeded",
  "payment_intent.succeeded",
  "checkout.session.completed",
  "checkout.session.expired",
  "charge.refunded",
  "refund.created",
] as const;
export type EventType = (typeof EVENT_TYPES)[number];

/** Which API call (if any) caused an event, as Stripe reports it in `event.request`. */
export interface RequestOrigin {
  requestId: string | null;
  idempotencyKey: string | null;
}

export const NO_API_REQUEST: RequestOrigin = { requestId: null, idempotencyKey: null };

export class EventLog {
  private readonly store: Store;
  private readonly dispatcher: WebhookDispatcher;
  private readonly apiVersion: string;
  private readonly nowSeconds: () => number;

  constructor(store: Store, dispatcher: WebhookDispatcher, apiVersion: string, nowSeconds: () => number) {
    this.store = store;
    this.dispatcher = dispatcher;
    this.apiVersion = apiVersion;
    this.nowSeconds = nowSeconds;
  }

  /** Stores the event and queues its deliveries; the caller saves the store afterwards. */
  emit(type: EventType, object: ApiObject, origin: RequestOrigin, previousAttributes?: Record<string, unknown>): ApiEvent {
    const event: ApiEvent = {
      id: newId("evt"),
      object: "event",
      api_version: this.apiVersion,
      created: this.nowSeconds(),
      // A deep copy: the event shows the object as it was at this moment.
      data: {
        object: structuredClone(object),
        ...(previousAttributes ? { previous_attributes: previousAttributes } : {}),
      },
      livemode: false,
      pending_webhooks: 0,
      request: { id: origin.requestId, idempotency_key: origin.idempotencyKey },
      type,
    };
    this.store.state.events[event.id] = event;
    this.dispatcher.enqueue(event);
    event.pending_webhooks = this.dispatcher.pendingFor(event.id);
    return event;
  }

  retrieve(id: string): ApiEvent | undefined {
    const event = this.store.state.events[id];
    if (!event) return undefined;
    return { ...event, pending_webhooks: this.dispatcher.pendingFor(id) };
  }
}
