import { mkdirSync } from "node:fs";
import { join, resolve } from "node:path";
import { startProc, stopProcs, type Proc } from "./procs";
import { waitForPort } from "./ports";

/**
 * The services around the app: S3 fake, SMTP catcher, payments fake, worker and web server.
 * `npm start` and `npm test` both bring them up through this one function, with different ports and folders.
 */
export interface StackPorts {
  web: number;
  s3: number;
  smtp: number;
  mailWeb: number;
  payments: number;
}

export interface StackOptions {
  ports: StackPorts;
  dataDir: string; // s3 objects, payments state, work folders
  env: NodeJS.ProcessEnv; // DATABASE_URL etc. for app processes
  services?: ("s3" | "mail" | "payments" | "worker" | "web")[];
  quiet?: boolean;
}

export function appEnv(ports: StackPorts, databaseUrl: string, dataDir: string, base: NodeJS.ProcessEnv = process.env): NodeJS.ProcessEnv {
  const appUrl = `http://127.0.0.1:${ports.web}`;
  return {
    ...base,
    DATABASE_URL: databaseUrl,
    APP_URL: appUrl,
    S3_ENDPOINT: `http://127.0.0.1:${ports.s3}`,
    SMTP_PORT: String(ports.smtp),
    STRIPE_API_PORT: String(ports.payments),
    WORKDIR: join(resolve(dataDir), "work"),
  };
}

const TSX = resolve("node_modules/tsx/dist/cli.mjs");

export async function startStack(opts: StackOptions): Promise<{ procs: Proc[]; stop(): Promise<void> }> {
  const { ports, env } = opts;
  const want = new Set(opts.services ?? ["s3", "mail", "payments", "worker", "web"]);
  const dataDir = resolve(opts.dataDir);
  mkdirSync(dataDir, { recursive: true });
  const procs: Proc[] = [];
  const q = { quiet: opts.quiet };
  if (want.has("s3")) {
    procs.push(
      startProc("s3", process.execPath, [TSX, "fakes/s3/server.ts"], { ...env, S3_FAKE_PORT: String(ports.s3), S3_FAKE_DIR: join(dataDir, "s3") }, q),
    );
  }
  if (want.has("mail")) {
    procs.push(
      startProc(
        "mail",
        process.execPath,
        ["node_modules/maildev/dist/bin/maildev.js", "--ip", "127.0.0.1", "--smtp", String(ports.smtp), "--web-ip", "127.0.0.1", "--web", String(ports.mailWeb), "--silent"],
        env,
        q,
      ),
    );
  }
  if (want.has("payments")) {
    procs.push(
      startProc(
        "payments",
        process.execPath,
        [TSX, "fakes/payments/server.ts"],
        {
          ...env,
          PAYMENTS_FAKE_PORT: String(ports.payments),
          PAYMENTS_FAKE_PUBLIC_URL: `http://127.0.0.1:${ports.payments}`,
          PAYMENTS_FAKE_WEBHOOK_URL: `${env.APP_URL}/api/payments/webhook`,
          PAYMENTS_FAKE_WEBHOOK_SECRET: env.STRIPE_WEBHOOK_SECRET ?? "whsec_gatecrash_local_secret",
          PAYMENTS_FAKE_SECRET_KEY: env.STRIPE_SECRET_KEY ?? "sk_test_gatecrash_local",
          PAYMENTS_FAKE_DATA_DIR: join(dataDir, "payments"),
        },
        q,
      ),
    );
  }
  const waits = [
    want.has("s3") && waitForPort(ports.s3),
    want.has("mail") && waitForPort(ports.smtp),
    want.has("payments") && waitForPort(ports.payments),
  ].filter(Boolean);
  await Promise.all(waits);
  if (want.has("worker")) procs.push(startProc("worker", process.execPath, [TSX, "app/worker.server.ts"], env, q));
  if (want.has("web")) {
    procs.push(
      startProc(
        "web",
        process.execPath,
        // Gatecrash's own server (server/main.ts): security headers on static files too, compression, body limits,
        // graceful stop on SIGTERM.
        ["--import", "tsx", "server/main.ts", env.GATECRASH_BUILD_DIR ?? "build"],
        { ...env, NODE_ENV: "production", PORT: String(ports.web), HOST: "127.0.0.1" },
        q,
      ),
    );
    await waitForPort(ports.web, 60_000);
  }
  return { procs, stop: () => stopProcs(procs) };
}
