/** Back-off for autosave retries when the connection drops: 1 s, 2 s, 4 s … capped at 30 s. Pure. */
export function retryDelayMs(attempt: number, baseMs = 1000, capMs = 30_000): number {
  return Math.min(capMs, baseMs * 2 ** Math.max(0, attempt));
}
