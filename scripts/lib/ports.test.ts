import { createServer, type Server } from "node:net";
import { afterEach, describe, expect, it } from "vitest";
import { freePort, isListening, waitForPort } from "./ports";

const servers: Server[] = [];
afterEach(() => { for (const s of servers.splice(0)) s.close(); });

function listen(port: number): Promise<Server> {
  return new Promise((resolve, reject) => {
    const srv = createServer((socket) => socket.destroy());
    srv.once("error", reject);
    srv.listen(port, "127.0.0.1", () => { servers.push(srv); resolve(srv); });
  });
}

describe("waiting for a service's port", () => {
  it("never holds the port itself, so a service binding while it waits starts fine", async () => {
    const port = await freePort();
    expect(await isListening(port)).toBe(false);
    const waiting = waitForPort(port, 10_000);
    // bind repeatedly while the probe runs: a probe that binds would make one of these fail with EADDRINUSE
    for (let i = 0; i < 20; i++) {
      const srv = await listen(port);
      await new Promise<void>((resolve) => srv.close(() => resolve()));
      servers.splice(servers.indexOf(srv), 1);
    }
    await listen(port);
    await waiting;
    expect(await isListening(port)).toBe(true);
  });

  it("gives up with the port in the message", async () => {
    const port = await freePort();
    await expect(waitForPort(port, 300)).rejects.toThrow(`127.0.0.1:${port}`);
  });
});
