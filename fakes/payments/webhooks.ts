// Hands events to the webhook receiver: signed, every event sent `copies` times on purpose
// (receivers must cope with duplicates), each copy retried with backoff until it gets a 2xx
// or runs out of attempts. Every attempt lands in the delivery log.
import { newId } from "./ids";
import { signatureHeader } from "./signature";
import type { Store } from "./store";
import type { ApiEvent, PendingDelivery } from "./types";

export interface WebhookSettings {
  url: string | undefined;
  secret: string | undefined;
  /** How many independent deliveries each event gets (at least 1; 2 by default). */
  copies: number;
  /** Wait before the deliberate duplicate copies start, in ms. */
  duplicateGapMs: number;
  /** Wait after failed attempt n is retryDelaysMs[n-1]; attempts per copy = length + 1. */
  retryDelaysMs: number[];
  /** Per-attempt timeout, in ms. */
  timeoutMs: number;
}

function chainKey(item: { event_id: string; copy: number }): string {
  return `${item.event_id}#${item.copy}`;
}

export class WebhookDispatcher {
  private readonly store: Store;
  private readonly settings: WebhookSettings;
  private readonly timers = new Map<string, NodeJS.Timeout>();
  private readonly inFlight = new Map<string, { controller: AbortController; done: Promise<void> }>();
  private stopped = false;

  constructor(store: Store, settings: WebhookSettings) {
    this.store = store;
    this.settings = settings;
  }

  get enabled(): boolean {
    return this.settings.url !== undefined && this.settings.secret !== undefined;
  }

  pendingFor(eventId: string): number {
    return this.store.state.pendingDeliveries.filter((item) => item.event_id === eventId).length;
  }

  /** Queues the deliberate copies of a new event. The caller saves the store. */
  enqueue(event: ApiEvent): void {
    if (!this.enabled) return;
    const now = Date.now();
    for (let copy = 1; copy <= this.settings.copies; copy++) {
      const due = copy === 1 ? now : now + this.settings.duplicateGapMs;
      this.addPending({ event_id: event.id, copy, attempt: 1, due_at: due });
    }
  }

  /** Starts one more delivery of an existing event; returns its copy number, or null when webhooks are off. */
  resend(eventId: string): number | null {
    if (!this.enabled) return null;
    const state = this.store.state;
    const copies = [
      ...state.deliveries.filter((d) => d.event_id === eventId).map((d) => d.copy),
      ...state.pendingDeliveries.filter((p) => p.event_id === eventId).map((p) => p.copy),
    ];
    const copy = Math.max(0, ...copies) + 1;
    this.addPending({ event_id: eventId, copy, attempt: 1, due_at: Date.now() });
    this.store.save();
    return copy;
  }

  /** Schedules everything pending, e.g. after a restart. */
  resume(): void {
    for (const item of this.store.state.pendingDeliveries) this.schedule(item);
  }

  async stop(): Promise<void> {
    this.stopped = true;
    for (const timer of this.timers.values()) clearTimeout(timer);
    this.timers.clear();
    for (const { controller } of this.inFlight.values()) controller.abort();
    await Promise.all([...this.inFlight.values()].map(({ done }) => done));
  }

  private addPending(item: PendingDelivery): void {
    this.store.state.pendingDeliveries.push(item);
    this.schedule(item);
  }

  private schedule(item: PendingDelivery): void {
    if (this.stopped) return;
    const key = chainKey(item);
    const existing = this.timers.get(key);
    if (existing) clearTimeout(existing);
    const timer = setTimeout(() => {
      this.timers.delete(key);
      const controller = new AbortController();
      const done = this.attempt(item, controller).finally(() => this.inFlight.delete(key));
      this.inFlight.set(key, { controller, done });
    }, Math.max(0, item.due_at - Date.now()));
    this.timers.set(key, timer);
  }

  private async attempt(item: PendingDelivery, shutdown: AbortController): Promise<void> {
    const event = this.store.state.events[item.event_id];
    const url = this.settings.url as string;
    const secret = this.settings.secret as string;
    if (!event) {
      this.removePending(item);
      return;
    }
    const payload = JSON.stringify({ ...event, pending_webhooks: this.pendingFor(event.id) }, null, 2);
    const attemptedAt = Date.now();
    let statusCode: number | null = null;
    let failure: string | null = null;
    try {
      const response = await fetch(url, {
        method: "POST",
        headers: {
          "Content-Type": "application/json; charset=utf-8",
          "Stripe-Signature": signatureHeader(payload, secret, Math.floor(attemptedAt / 1000)),
          "User-Agent": "Gatecrash-PaymentsFake/1.0",
        },
        body: payload,
        redirect: "manual",
        signal: AbortSignal.any([shutdown.signal, AbortSignal.timeout(this.settings.timeoutMs)]),
      });
      statusCode = response.status;
      await response.arrayBuffer();
      if (statusCode < 200 || statusCode > 299) failure = `receiver answered HTTP ${statusCode}`;
    } catch (error) {
      // Shutting down is not the receiver's fault: keep the attempt pending for the next start.
      if (shutdown.signal.aborted) return;
      failure = describeFetchError(error);
    }

    const succeeded = failure === null;
    const retryDelay = this.settings.retryDelaysMs[item.attempt - 1];
    const nextAttemptAt = !succeeded && retryDelay !== undefined ? Date.now() + retryDelay : null;
    this.store.state.deliveries.push({
      id: newId("dlv"),
      event_id: event.id,
      event_type: event.type,
      copy: item.copy,
      attempt: item.attempt,
      attempted_at: attemptedAt,
      url,
      status_code: statusCode,
      error: failure,
      succeeded,
      next_attempt_at: nextAttemptAt,
    });
    if (nextAttemptAt === null) {
      this.removePending(item);
    } else {
      item.attempt += 1;
      item.due_at = nextAttemptAt;
      this.schedule(item);
    }
    this.store.save();
  }

  private removePending(item: PendingDelivery): void {
    const list = this.store.state.pendingDeliveries;
    const index = list.indexOf(item);
    if (index >= 0) list.splice(index, 1);
  }
}

function describeFetchError(error: unknown): string {
  if (!(error instanceof Error)) return String(error);
  const cause = (error as Error & { cause?: unknown }).cause;
  if (cause instanceof Error) return `${error.message}: ${cause.message}`;
  return error.message;
}
