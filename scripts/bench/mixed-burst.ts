// The vote burst of a busy party, for the load bench: 500 ballot requests at once — fresh vote codes, codes sent
// again, wrong codes, signed-in accounts (some casting twice) — while 50 judges autosave their grids, then a page
// must still answer in under a second and the database must hold exactly one ballot per code and per account.
// Latencies are measured per request here (p50/p95/p99), and the same burst shape of a bare page is the reference.
import { performance } from "node:perf_hooks";

export interface TimedRequest {
  url: string;
  init: RequestInit;
  kind: string;
}

export interface BurstResult {
  ms: number[];
  wallMs: number;
  statuses: Record<string, Record<string, number>>;
  noAnswer: number;
  /** Each request's status, in the order of the requests. */
  each: string[];
}

const DEADLINE_MS = 60_000;

/** One request, read to the end: its status (or "no answer" by the deadline) and how long it took. */
async function timed(url: string, init: RequestInit): Promise<{ status: string; ms: number }> {
  const t0 = performance.now();
  try {
    const res = await fetch(url, { ...init, signal: AbortSignal.timeout(DEADLINE_MS) });
    await res.arrayBuffer();
    return { status: String(res.status), ms: performance.now() - t0 };
  } catch {
    return { status: "no answer", ms: performance.now() - t0 };
  }
}

/** Fires every request at once and records each one's latency and status by kind. */
export async function fireAll(requests: TimedRequest[]): Promise<BurstResult> {
  const statuses: Record<string, Record<string, number>> = {};
  const ms: number[] = [];
  const each: string[] = [];
  let noAnswer = 0;
  const started = performance.now();
  await Promise.all(
    requests.map(async (r, i) => {
      const { status, ms: took } = await timed(r.url, r.init);
      if (status === "no answer") noAnswer += 1;
      ms.push(took);
      each[i] = status;
      statuses[r.kind] ??= {};
      statuses[r.kind][status] = (statuses[r.kind][status] ?? 0) + 1;
    }),
  );
  return { ms, wallMs: performance.now() - started, statuses, noAnswer, each };
}

export function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[i];
}

export function describe(name: string, r: BurstResult, ref?: BurstResult): string {
  const s = [...r.ms].sort((a, b) => a - b);
  const rps = (r.ms.length / r.wallMs) * 1000;
  const line = [`${name.padEnd(34)} ${rps.toFixed(0).padStart(6)} req/s`, `p50 ${percentile(s, 50).toFixed(0)} ms`, `p95 ${percentile(s, 95).toFixed(0)} ms`, `p99 ${percentile(s, 99).toFixed(0)} ms`];
  if (ref) {
    const b = [...ref.ms].sort((a, c) => a - c);
    const refRps = (ref.ms.length / ref.wallMs) * 1000;
    line.push(`(throughput ×${(rps / refRps).toFixed(2)} of the bare page, p50 ×${(percentile(s, 50) / percentile(b, 50)).toFixed(2)}, p99 ×${(percentile(s, 99) / percentile(b, 99)).toFixed(2)})`);
  }
  line.push(`requests ${r.ms.length}, no answer ${r.noAnswer}, statuses ${JSON.stringify(r.statuses)}`);
  return line.join("  ");
}

/** Sequential saves per judge, all judges at once: each judge's grid autosaving cell after cell. */
export async function judgesAutosave(
  url: string,
  origin: string,
  judges: { cookie: string; cells: { entryId: string; criterionId: string; value: number }[] }[],
): Promise<BurstResult> {
  const statuses: Record<string, Record<string, number>> = { autosave: {} };
  const ms: number[] = [];
  let noAnswer = 0;
  const started = performance.now();
  await Promise.all(
    judges.map(async (j) => {
      for (const cell of j.cells) {
        const { status, ms: took } = await timed(url, {
          method: "POST",
          headers: { "content-type": "application/json", origin, cookie: j.cookie },
          body: JSON.stringify({ ...cell, version: 0 }),
        });
        if (status === "no answer") noAnswer += 1;
        ms.push(took);
        statuses.autosave[status] = (statuses.autosave[status] ?? 0) + 1;
      }
    }),
  );
  return { ms, wallMs: performance.now() - started, statuses, noAnswer, each: [] };
}
