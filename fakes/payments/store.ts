// All fake state in one JSON-serialisable value, optionally persisted to a data folder.
// Writes go to a temporary file first and are renamed into place, so a crash mid-write
// never leaves a half-written state file behind.
import { mkdirSync, readFileSync, renameSync, writeFileSync, existsSync } from "node:fs";
import { join } from "node:path";
import type {
  ApiEvent,
  Charge,
  DeliveryAttempt,
  IdempotencyRecord,
  PaymentIntent,
  PendingDelivery,
  Refund,
  StoredCheckoutSession,
} from "./types";

const STATE_VERSION = 1;
export const STATE_FILE_NAME = "payments-fake-state.json";

export interface FakeState {
  version: typeof STATE_VERSION;
  sessions: Record<string, StoredCheckoutSession>;
  paymentIntents: Record<string, PaymentIntent>;
  charges: Record<string, Charge>;
  refunds: Record<string, Refund>;
  events: Record<string, ApiEvent>;
  deliveries: DeliveryAttempt[];
  pendingDeliveries: PendingDelivery[];
  idempotency: Record<string, IdempotencyRecord>;
}

function emptyState(): FakeState {
  return {
    version: STATE_VERSION,
    sessions: {},
    paymentIntents: {},
    charges: {},
    refunds: {},
    events: {},
    deliveries: [],
    pendingDeliveries: [],
    idempotency: {},
  };
}

export class Store {
  readonly state: FakeState;
  private readonly file: string | null;

  private constructor(state: FakeState, file: string | null) {
    this.state = state;
    this.file = file;
  }

  /** Opens the state in `dataDir` (created if needed), or an in-memory store without one. */
  static open(dataDir: string | undefined): Store {
    if (dataDir === undefined || dataDir === "") return new Store(emptyState(), null);
    mkdirSync(dataDir, { recursive: true });
    const file = join(dataDir, STATE_FILE_NAME);
    if (!existsSync(file)) return new Store(emptyState(), file);
    let parsed: unknown;
    try {
      parsed = JSON.parse(readFileSync(file, "utf8"));
    } catch (error) {
      // Refuse to start rather than silently replace someone's payments history.
      throw new Error(`Payments fake state file ${file} is not valid JSON: ${(error as Error).message}`);
    }
    if (typeof parsed !== "object" || parsed === null || (parsed as { version?: unknown }).version !== STATE_VERSION) {
      throw new Error(`Payments fake state file ${file} has an unknown format (expected version ${STATE_VERSION}).`);
    }
    return new Store({ ...emptyState(), ...(parsed as FakeState) }, file);
  }

  save(): void {
    if (this.file === null) return;
    const temporary = `${this.file}.${process.pid}.tmp`;
    writeFileSync(temporary, JSON.stringify(this.state));
    renameSync(temporary, this.file);
  }
}
