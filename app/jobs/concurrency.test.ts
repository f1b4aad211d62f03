import { availableParallelism } from "node:os";
import { afterEach, describe, expect, it, vi } from "vitest";

/** WORKER_CONCURRENCY is read once through env(), validated by zod like every setting. */
const saved = process.env.WORKER_CONCURRENCY;
afterEach(() => {
  if (saved === undefined) delete process.env.WORKER_CONCURRENCY;
  else process.env.WORKER_CONCURRENCY = saved;
  vi.resetModules();
});

async function freshEnv(value: string | undefined) {
  if (value === undefined) delete process.env.WORKER_CONCURRENCY;
  else process.env.WORKER_CONCURRENCY = value;
  vi.resetModules();
  return (await import("~/env.server")).env;
}

describe("WORKER_CONCURRENCY", () => {
  it("defaults to one less than the cores, and at least one", async () => {
    const env = await freshEnv(undefined);
    expect(env().WORKER_CONCURRENCY).toBe(Math.max(1, availableParallelism() - 1));
    expect(env().WORKER_CONCURRENCY).toBeGreaterThanOrEqual(1);
  });

  it("takes a whole number of slots", async () => {
    expect((await freshEnv("3"))().WORKER_CONCURRENCY).toBe(3);
  });

  it("refuses zero, fractions and words with a message naming the setting", async () => {
    for (const bad of ["0", "1.5", "many"]) {
      const env = await freshEnv(bad);
      expect(() => env(), bad).toThrow(/WORKER_CONCURRENCY/);
    }
  });
});
