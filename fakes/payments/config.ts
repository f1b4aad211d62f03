// Settings of the payments fake, and how they are read from PAYMENTS_FAKE_* variables.

export interface PaymentsFakeOptions {
  /** The API key clients must present (Authorization: Bearer …). */
  secretKey: string;
  /** TCP port on 127.0.0.1; 0 picks a free one. */
  port?: number;
  /** Where events are POSTed; no URL, no deliveries. */
  webhookUrl?: string;
  /** The endpoint secret (whsec_…) used, as given, as the HMAC key. */
  webhookSecret?: string;
  /** Folder for the state file; without it state lives in memory only. */
  dataDir?: string;
  /** Origin browsers use to reach the fake (for session `url`); defaults to the listening address. */
  publicUrl?: string;
  /** Deliveries per event on purpose (default 2), so receivers prove they handle duplicates. */
  webhookCopies?: number;
  /** Delay before the duplicate copies start, in ms (default 500). */
  duplicateGapMs?: number;
  /** Backoff after each failed attempt, in ms; attempts per copy = length + 1 (default 1 s, 5 s, 30 s, 2 min). */
  webhookRetryDelaysMs?: number[];
  /** Per-attempt timeout in ms (default 10 s). */
  webhookTimeoutMs?: number;
  /** `api_version` stamped on events. */
  apiVersion?: string;
  /** Clock for object timestamps and session expiry, in ms since the epoch (tests move it). */
  now?: () => number;
}

type Environment = Record<string, string | undefined>;

function integer(environment: Environment, name: string): number | undefined {
  const raw = environment[name];
  if (raw === undefined || raw === "") return undefined;
  if (!/^\d+$/.test(raw)) throw new Error(`${name} must be a whole number, got ${JSON.stringify(raw)}.`);
  return Number(raw);
}

function integerList(environment: Environment, name: string): number[] | undefined {
  const raw = environment[name];
  if (raw === undefined || raw === "") return undefined;
  const parts = raw.split(",").map((part) => part.trim());
  if (!parts.every((part) => /^\d+$/.test(part))) {
    throw new Error(`${name} must be comma-separated milliseconds, like 1000,5000,30000; got ${JSON.stringify(raw)}.`);
  }
  return parts.map(Number);
}

export function optionsFromEnvironment(environment: Environment): PaymentsFakeOptions {
  const secretKey = environment.PAYMENTS_FAKE_SECRET_KEY;
  if (!secretKey) throw new Error("PAYMENTS_FAKE_SECRET_KEY is required: the API key the app sends, e.g. sk_test_gatecrash_local.");
  const webhookUrl = environment.PAYMENTS_FAKE_WEBHOOK_URL || undefined;
  const webhookSecret = environment.PAYMENTS_FAKE_WEBHOOK_SECRET || undefined;
  if (webhookUrl && !webhookSecret) throw new Error("PAYMENTS_FAKE_WEBHOOK_URL is set, so PAYMENTS_FAKE_WEBHOOK_SECRET (whsec_…) is required too.");
  if (webhookSecret && !webhookSecret.startsWith("whsec_")) throw new Error("PAYMENTS_FAKE_WEBHOOK_SECRET must start with whsec_.");
  return {
    secretKey,
    port: integer(environment, "PAYMENTS_FAKE_PORT") ?? 12111,
    webhookUrl,
    webhookSecret,
    dataDir: environment.PAYMENTS_FAKE_DATA_DIR || undefined,
    publicUrl: environment.PAYMENTS_FAKE_PUBLIC_URL || undefined,
    webhookCopies: integer(environment, "PAYMENTS_FAKE_WEBHOOK_COPIES"),
    duplicateGapMs: integer(environment, "PAYMENTS_FAKE_WEBHOOK_DUPLICATE_GAP_MS"),
    webhookRetryDelaysMs: integerList(environment, "PAYMENTS_FAKE_WEBHOOK_RETRY_DELAYS_MS"),
    webhookTimeoutMs: integer(environment, "PAYMENTS_FAKE_WEBHOOK_TIMEOUT_MS"),
  };
}
