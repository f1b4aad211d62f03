import { randomBytes } from "node:crypto";
import { chmodSync, existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { dirname } from "node:path";

/**
 * Secrets of a local stack (`npm start`, `npm test`, the load bench): the web server runs as in production, where
 * the committed development defaults are refused (app/env.server.ts), so each stack makes its own random ones.
 * `npm start` keeps them in .gatecrash/secrets.json (mode 600) across restarts: sessions, vote-code cookies and
 * the S3 fake's keys stay valid. Variables already set in the environment win.
 */
export type LocalSecrets = Record<"BETTER_AUTH_SECRET" | "STRIPE_SECRET_KEY" | "STRIPE_WEBHOOK_SECRET" | "S3_ACCESS_KEY_ID" | "S3_SECRET_ACCESS_KEY", string>;

function fresh(): LocalSecrets {
  const hex = (n: number) => randomBytes(n).toString("hex");
  return {
    BETTER_AUTH_SECRET: randomBytes(36).toString("base64url"),
    STRIPE_SECRET_KEY: `sk_test_local_${hex(16)}`,
    STRIPE_WEBHOOK_SECRET: `whsec_local_${hex(24)}`,
    S3_ACCESS_KEY_ID: `GCLOCAL${hex(6).toUpperCase()}`,
    S3_SECRET_ACCESS_KEY: hex(20),
  };
}

/** The stack's secrets: read from `file` when it exists, else made and (when `file` is given) written there. */
export function localSecrets(file?: string): LocalSecrets {
  if (file && existsSync(file)) return { ...fresh(), ...(JSON.parse(readFileSync(file, "utf8")) as Partial<LocalSecrets>) };
  const made = fresh();
  if (file) {
    mkdirSync(dirname(file), { recursive: true });
    writeFileSync(file, JSON.stringify(made, null, 2) + "\n", { mode: 0o600 });
    chmodSync(file, 0o600);
  }
  return made;
}

/** For scripts that talk to a running `npm start` stack (backup, restore): its secrets, unless already set. */
export function useLocalSecretsIfPresent(file: string, target: NodeJS.ProcessEnv = process.env): void {
  if (!existsSync(file)) return;
  for (const [k, v] of Object.entries(localSecrets(file))) target[k] ??= v;
}
