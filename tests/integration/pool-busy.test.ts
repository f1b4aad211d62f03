import postgres from "postgres";
import { afterAll, beforeAll, describe, expect, it } from "vitest";

/**
 * A web process whose pool is full answers 503 with Retry-After (the API error shape), never a hang: the built
 * server with a pool of two (one transaction slot) and a short acquire timeout. The test holds a row lock on one
 * vote code from its own connection, so the server's ballot transaction for that code waits holding the one slot;
 * ballots for other codes then find no slot in time. Once the lock goes, the waiting ballot is stored.
 */
let server: Awaited<ReturnType<typeof import("../security/listener").listenBuilt>>;
let base: string;
let lockConn: ReturnType<typeof postgres>;
let closeDb: () => Promise<void>;

beforeAll(async () => {
  // Before any app module reads its settings (env() is read once, lazily).
  process.env.DATABASE_POOL_MAX = "2";
  process.env.DATABASE_ACQUIRE_TIMEOUT_MS = "100";
  closeDb = (await import("~/db/client.server")).closeDb;
  const { listenBuilt } = await import("../security/listener");
  server = await listenBuilt();
  base = server.base;
  lockConn = postgres(process.env.DATABASE_URL!, { max: 1, onnotice: () => {} });
}, 120_000);

afterAll(async () => {
  await server?.close();
  await lockConn?.end({ timeout: 5 });
  const { stopQueue } = await import("~/jobs/queue.server");
  await stopQueue();
  await closeDb?.();
});

describe("a full pool", () => {
  it("answers 503 database_busy with Retry-After instead of waiting, and serves again once a slot is free", async () => {
    const { makeCompo } = await import("./showcase.fixtures");
    const { generateVoteCodes } = await import("~/voting/voting.server");
    const f = await makeCompo({ method: "borda" });
    const codes = await generateVoteCodes(f.competitionId, 20);
    const ranking = f.entries.map((e) => e.id);
    const put = (code: string) =>
      fetch(`${base}/api/ballots/${f.competitionId}`, {
        method: "PUT",
        headers: { "content-type": "application/json", origin: base },
        body: JSON.stringify({ code, ballot: { ranking } }),
        signal: AbortSignal.timeout(30_000),
      });

    let unlock!: () => void;
    const unlocked = new Promise<void>((r) => (unlock = r));
    let locked!: () => void;
    const isLocked = new Promise<void>((r) => (locked = r));
    const holder = lockConn.begin(async (tx) => {
      await tx`select id from vote_codes where code = ${codes[0]} for update`;
      locked();
      await unlocked;
    });
    await isLocked;
    const waiting = put(codes[0]);
    // The waiting ballot holds the slot once its UPDATE blocks on the row lock: poll until others are turned away.
    let busy: Response | undefined;
    for (const code of codes.slice(1)) {
      const res = await put(code);
      if (res.status === 503) {
        busy = res;
        break;
      }
      await res.arrayBuffer();
    }
    unlock();
    await holder;
    expect(busy, "no ballot was turned away while the only slot was held").toBeDefined();
    expect(busy!.headers.get("retry-after")).toMatch(/^\d+$/);
    expect(await busy!.json()).toEqual({ error: { status: 503, code: "database_busy", message: expect.any(String) } });
    expect((await waiting).status).toBe(200);
    const page = await fetch(`${base}/check-your-mail`, { signal: AbortSignal.timeout(30_000) });
    expect(page.status).toBe(200);
  }, 120_000);
});
