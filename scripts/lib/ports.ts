import { connect, createServer } from "node:net";

export function isPortFree(port: number, host = "127.0.0.1"): Promise<boolean> {
  return new Promise((resolve) => {
    const srv = createServer();
    srv.once("error", () => resolve(false));
    srv.listen(port, host, () => srv.close(() => resolve(true)));
  });
}

/** The preferred port when free, else the next free one above it. */
export async function pickPort(preferred: number): Promise<number> {
  for (let p = preferred; p < preferred + 200; p++) if (await isPortFree(p)) return p;
  throw new Error(`no free port near ${preferred}`);
}

/** An ephemeral free port chosen by the kernel. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.once("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const addr = srv.address();
      const port = typeof addr === "object" && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

/** Whether something accepts TCP connections on the port. */
export function isListening(port: number, host = "127.0.0.1"): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = connect({ port, host });
    socket.once("connect", () => { socket.destroy(); resolve(true); });
    socket.once("error", () => { socket.destroy(); resolve(false); });
  });
}

// Probes by connecting, never by binding: a probe that binds the port for a moment can take it from the
// service starting up, which then dies with EADDRINUSE while we wait for it.
export async function waitForPort(port: number, timeoutMs = 30_000, host = "127.0.0.1"): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (await isListening(port, host)) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`nothing listened on ${host}:${port} within ${timeoutMs} ms`);
}
