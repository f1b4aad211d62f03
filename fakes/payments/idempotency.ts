// Idempotency-Key handling as the Stripe docs describe it: the first response for a key is
// saved and replayed for retries; reusing a key with other parameters is an error.
import { ApiError, invalidRequest } from "./errors";
import type { FormValue } from "./form";
import type { Store } from "./store";
import type { IdempotencyRecord } from "./types";

const MAX_KEY_LENGTH = 255;
// Stripe keeps keys for at least 24 hours; after that a reused key starts a new request.
const KEY_LIFETIME_MS = 24 * 60 * 60 * 1000;

function canonical(value: FormValue): string {
  if (typeof value === "string") return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map(canonical).join(",")}]`;
  const keys = Object.keys(value).sort();
  return `{${keys.map((key) => `${JSON.stringify(key)}:${canonical(value[key])}`).join(",")}}`;
}

export function requestFingerprint(method: string, path: string, params: FormValue): string {
  return `${method} ${path} ${canonical(params)}`;
}

export class IdempotencyCache {
  private readonly store: Store;

  constructor(store: Store) {
    this.store = store;
  }

  static validateKey(key: string): void {
    if (key.length === 0 || key.length > MAX_KEY_LENGTH) {
      throw invalidRequest(`Idempotency-Key must be between 1 and ${MAX_KEY_LENGTH} characters long.`, {
        code: "idempotency_key_invalid",
      });
    }
  }

  /** The saved response for this key, or undefined when the request should run. */
  lookup(key: string, fingerprint: string): IdempotencyRecord | undefined {
    const record = this.store.state.idempotency[key];
    if (!record) return undefined;
    if (Date.now() - record.created > KEY_LIFETIME_MS) {
      delete this.store.state.idempotency[key];
      return undefined;
    }
    if (record.fingerprint !== fingerprint) {
      throw new ApiError(
        400,
        "idempotency_error",
        `Keys for idempotent requests can only be used with the same endpoint and parameters they were first used with. Try a new key instead of ${key}.`,
      );
    }
    return record;
  }

  remember(key: string, fingerprint: string, status: number, body: string): void {
    this.store.state.idempotency[key] = { fingerprint, status, body, created: Date.now() };
    this.store.save();
  }
}
