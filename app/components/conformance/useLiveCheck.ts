import { useEffect, useState } from "react";
import type { EntryCheck } from "~/conformance/report-types";

/** How often the entry page asks for news while a check waits or runs: findings arrive step by step. */
const POLL_MS = 1000;

export function checkIsActive(check: EntryCheck | null): boolean {
  return check?.run?.state === "queued" || check?.run?.state === "running";
}

/**
 * The entry's check report, kept live: while the run waits or runs it asks the JSON API once a second. The page's
 * header card and the report panel both read this one state, so they never disagree. A revalidated page (a new
 * upload) brings a new starting point.
 */
export function useLiveCheck(entryId: string, initial: EntryCheck | null): { check: EntryCheck | null; offline: boolean } {
  const [live, setLive] = useState({ from: initial, check: initial });
  const [offline, setOffline] = useState(false);
  // one more on every answer (or failure), so the next question is asked after it
  const [asked, setAsked] = useState(0);
  let check = live.check;
  if (live.from !== initial) {
    setLive({ from: initial, check: initial });
    check = initial;
  }
  const active = checkIsActive(check);

  useEffect(() => {
    if (!active) return;
    let stopped = false;
    const timer = setTimeout(async () => {
      try {
        const res = await fetch(`/api/checks/${entryId}`, { headers: { accept: "application/json" } });
        if (!res.ok) throw new Error(String(res.status));
        const body = (await res.json()) as { check: EntryCheck | null };
        if (!stopped) {
          setLive((l) => ({ from: l.from, check: body.check }));
          setOffline(false);
        }
      } catch {
        // A dropped connection: keep what we have and ask again on the next tick.
        if (!stopped) setOffline(true);
      }
      if (!stopped) setAsked((n) => n + 1);
    }, POLL_MS);
    return () => {
      stopped = true;
      clearTimeout(timer);
    };
  }, [active, entryId, asked]);

  return { check, offline };
}
