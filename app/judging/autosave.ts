import { retryDelayMs } from "./retry";

/**
 * The scoring grid's autosave, one state machine for score cells and notes alike (free of React and of fetch, so it
 * is tested on its own). Every slot — one cell, or one entry's note — keeps what the judge typed and what the server
 * last confirmed, and is saved by itself with the version the tab last saw:
 *
 *   saved ──edit──▶ unsaved ──send──▶ saving ──2xx──▶ saved (or unsaved again if the judge typed on meanwhile)
 *                                       ├─ no answer / 5xx ─▶ unsaved, retried with back-off (retry.ts), at once when online
 *                                       ├─ 409 with `current` ─▶ conflict: keep mine (send again on their version) or take theirs
 *                                       └─ other 4xx ─▶ failed, with the server's reason (423: judging closed → locked)
 *
 * A slot never has two saves in flight; an edit during a save is sent when that save answers.
 */
export type SaveStatus = "saved" | "saving" | "unsaved" | "failed" | "conflict";

export interface Slot<T> {
  value: T;
  /** The last value the server confirmed. */
  saved: T;
  version: number;
  status: SaveStatus;
  message?: string;
  /** What another tab or device saved, after a 409. */
  theirs?: { value: T; version: number };
  attempts: number;
}

/** The wire: POSTs one slot's value with the version it is based on. A thrown error means no answer. */
export type SaveRequest<T> = (key: string, value: T, version: number) => Promise<Response>;

export interface AutosaveOptions<T> {
  request: SaveRequest<T>;
  /** The member of `saved` and `current` in the API's answers, and of `fieldErrors` for a refused value. */
  field: "value" | "note";
  /** The value when the server answers with none (null for a score, "" for a note). */
  empty: T;
  /** Called after every change of state, so the view can paint it. */
  onChange: () => void;
  /** Called when the server says judging is closed (423). */
  onLocked?: () => void;
  /** Timers, injectable so tests step through retries without waiting. */
  schedule?: (run: () => void, ms: number) => unknown;
  cancel?: (handle: unknown) => void;
}

interface ApiAnswer {
  saved?: Record<string, unknown> & { version: number };
  error?: { status: number; code: string; message: string; fieldErrors?: Record<string, string[]> };
  current?: Record<string, unknown> & { version: number };
}

export const OFFLINE_MESSAGE = "Offline? Kept here, retrying.";

export class Autosave<T> {
  private readonly slots = new Map<string, Slot<T>>();
  private readonly inFlight = new Set<string>();
  private readonly timers = new Map<string, unknown>();
  private readonly schedule: (run: () => void, ms: number) => unknown;
  private readonly cancel: (handle: unknown) => void;

  constructor(private readonly o: AutosaveOptions<T>) {
    this.schedule = o.schedule ?? ((run, ms) => setTimeout(run, ms));
    this.cancel = o.cancel ?? ((h) => clearTimeout(h as ReturnType<typeof setTimeout>));
  }

  /** A slot as the page loaded it (saved). */
  add(key: string, value: T, version: number): void {
    this.slots.set(key, { value, saved: value, version, status: "saved", attempts: 0 });
  }

  get(key: string): Slot<T> | undefined {
    return this.slots.get(key);
  }

  all(): IterableIterator<[string, Slot<T>]> {
    return this.slots.entries();
  }

  /** Unsaved or saving slots: the page warns before it is left while there are any. */
  pending(): number {
    let n = 0;
    for (const s of this.slots.values()) if (s.status === "unsaved" || s.status === "saving") n++;
    return n;
  }

  count(status: SaveStatus): number {
    let n = 0;
    for (const s of this.slots.values()) if (s.status === status) n++;
    return n;
  }

  /** The judge's edit. Going back to the confirmed value needs no request (unless the last save was refused). */
  edit(key: string, value: T): void {
    const st = this.slots.get(key);
    if (!st) return;
    st.value = value;
    st.theirs = undefined;
    st.message = undefined;
    if (value === st.saved && st.status !== "failed") {
      st.status = "saved";
      this.o.onChange();
      return;
    }
    st.status = "unsaved";
    st.attempts = 0;
    this.o.onChange();
    void this.send(key);
  }

  /** After a conflict: the judge keeps their value, saved over the other one's version. */
  keepMine(key: string): Promise<void> {
    return this.send(key);
  }

  /** After a conflict: the judge takes the other tab's value, which is what the server holds. */
  takeTheirs(key: string): void {
    const st = this.slots.get(key);
    if (!st?.theirs) return;
    st.value = st.theirs.value;
    st.saved = st.value;
    st.status = "saved";
    st.theirs = undefined;
    st.message = undefined;
    this.o.onChange();
  }

  /** Sends every slot that waits for a retry now (the browser is back online). */
  retryUnsaved(): void {
    for (const [key, st] of this.slots) {
      if (st.status !== "unsaved") continue;
      this.cancel(this.timers.get(key));
      this.timers.delete(key);
      void this.send(key);
    }
  }

  dispose(): void {
    for (const h of this.timers.values()) this.cancel(h);
    this.timers.clear();
  }

  async send(key: string): Promise<void> {
    const st = this.slots.get(key);
    if (!st || this.inFlight.has(key)) return;
    if (st.status === "saved" && st.value === st.saved) return;
    this.inFlight.add(key);
    const sent = st.value;
    st.status = "saving";
    this.o.onChange();
    let res: Response | null;
    try {
      res = await this.o.request(key, sent, st.version);
    } catch {
      res = null; // the connection dropped: keep the value and retry
    }
    this.inFlight.delete(key);
    if (res && res.ok) {
      const body = (await res.json()) as ApiAnswer;
      st.version = body.saved?.version ?? st.version;
      st.saved = this.read(body.saved);
      st.attempts = 0;
      st.message = undefined;
      st.theirs = undefined;
      if (st.value !== st.saved) {
        // the judge typed on while this save was away: send the newer value
        st.status = "unsaved";
        this.o.onChange();
        void this.send(key);
        return;
      }
      st.status = "saved";
    } else if (!res || res.status >= 500) {
      st.status = "unsaved";
      st.message = OFFLINE_MESSAGE;
      const delay = retryDelayMs(st.attempts);
      st.attempts += 1;
      this.cancel(this.timers.get(key));
      this.timers.set(
        key,
        this.schedule(() => {
          this.timers.delete(key);
          void this.send(key);
        }, delay),
      );
    } else {
      const body = (await res.json()) as ApiAnswer;
      if (res.status === 409 && body.current) {
        st.status = "conflict";
        st.theirs = { value: this.read(body.current), version: body.current.version };
        st.version = body.current.version;
        st.message = body.error?.message;
      } else {
        st.status = "failed";
        st.message = body.error?.fieldErrors?.[this.o.field]?.join(" ") ?? body.error?.message ?? "Not saved.";
        if (res.status === 423) this.o.onLocked?.();
      }
    }
    this.o.onChange();
  }

  private read(from: Record<string, unknown> | undefined): T {
    const v = from?.[this.o.field];
    return (v === undefined || v === null ? this.o.empty : v) as T;
  }
}
