// The command-line entry point: `tsx fakes/payments/server.ts`, configured by PAYMENTS_FAKE_* variables.
import { afterEach, describe, expect, it } from "vitest";
import { spawn, type ChildProcess } from "node:child_process";
import { fileURLToPath } from "node:url";
import { optionsFromEnvironment } from "./config";
import { TEST_SECRET_KEY, createEntryFeeSession, stripeClient, waitFor } from "./test-support";

const SERVER = fileURLToPath(new URL("./server.ts", import.meta.url));
const TSX = fileURLToPath(new URL("../../node_modules/tsx/dist/cli.mjs", import.meta.url));

let child: ChildProcess | undefined;
afterEach(async () => {
  if (child && child.exitCode === null) {
    const exited = new Promise((resolve) => child?.once("exit", resolve));
    child.kill("SIGTERM");
    await exited;
  }
  child = undefined;
});

describe("tsx fakes/payments/server.ts", () => {
  it("starts from the environment, serves the SDK and stops on SIGTERM", async () => {
    child = spawn(process.execPath, [TSX, SERVER], {
      env: { ...process.env, PAYMENTS_FAKE_PORT: "0", PAYMENTS_FAKE_SECRET_KEY: TEST_SECRET_KEY },
      stdio: ["ignore", "pipe", "pipe"],
    });
    let output = "";
    child.stdout?.on("data", (chunk: Buffer) => (output += chunk.toString()));
    child.stderr?.on("data", (chunk: Buffer) => (output += chunk.toString()));
    const port = await waitFor("the listening line", () => /listening on http:\/\/127\.0\.0\.1:(\d+)/.exec(output)?.[1], 30_000);
    const stripe = stripeClient(Number(port));
    const session = await createEntryFeeSession(stripe);
    expect(session.url).toBe(`http://127.0.0.1:${port}/pay/${session.id}`);

    const exited = new Promise<number | null>((resolve) => child?.once("exit", (code) => resolve(code)));
    child.kill("SIGTERM");
    expect(await exited).toBe(0);
  });

  it("exits with a clear message when the secret key is missing", async () => {
    const environment = { ...process.env };
    delete environment.PAYMENTS_FAKE_SECRET_KEY;
    child = spawn(process.execPath, [TSX, SERVER], { env: environment, stdio: ["ignore", "pipe", "pipe"] });
    let errors = "";
    child.stderr?.on("data", (chunk: Buffer) => (errors += chunk.toString()));
    const code = await new Promise<number | null>((resolve) => child?.once("exit", (exitCode) => resolve(exitCode)));
    expect(code).toBe(1);
    expect(errors).toContain("PAYMENTS_FAKE_SECRET_KEY is required");
  });
});

describe("optionsFromEnvironment", () => {
  it("reads every setting", () => {
    expect(
      optionsFromEnvironment({
        PAYMENTS_FAKE_SECRET_KEY: "sk_test_a",
        PAYMENTS_FAKE_PORT: "4100",
        PAYMENTS_FAKE_WEBHOOK_URL: "http://127.0.0.1:3000/api/payments/webhook",
        PAYMENTS_FAKE_WEBHOOK_SECRET: "whsec_abc",
        PAYMENTS_FAKE_DATA_DIR: "/tmp/fake",
        PAYMENTS_FAKE_PUBLIC_URL: "http://127.0.0.1:4100",
        PAYMENTS_FAKE_WEBHOOK_COPIES: "3",
        PAYMENTS_FAKE_WEBHOOK_RETRY_DELAYS_MS: "10, 20,30",
      }),
    ).toMatchObject({
      secretKey: "sk_test_a",
      port: 4100,
      webhookUrl: "http://127.0.0.1:3000/api/payments/webhook",
      webhookSecret: "whsec_abc",
      dataDir: "/tmp/fake",
      publicUrl: "http://127.0.0.1:4100",
      webhookCopies: 3,
      webhookRetryDelaysMs: [10, 20, 30],
    });
  });

  it.each([
    [{ PAYMENTS_FAKE_SECRET_KEY: "k", PAYMENTS_FAKE_PORT: "eighty" }, /PAYMENTS_FAKE_PORT/],
    [{ PAYMENTS_FAKE_SECRET_KEY: "k", PAYMENTS_FAKE_WEBHOOK_URL: "http://127.0.0.1:1/" }, /PAYMENTS_FAKE_WEBHOOK_SECRET/],
    [{ PAYMENTS_FAKE_SECRET_KEY: "k", PAYMENTS_FAKE_WEBHOOK_SECRET: "secret" }, /whsec_/],
    [{ PAYMENTS_FAKE_SECRET_KEY: "k", PAYMENTS_FAKE_WEBHOOK_RETRY_DELAYS_MS: "1s,2s" }, /comma-separated/],
  ])("refuses %j", (environment, message) => {
    expect(() => optionsFromEnvironment(environment)).toThrow(message);
  });
});
