import type { RequestListener } from "node:http";
import type { ServerBuild } from "react-router";
import { createApp } from "../../server/app";

/**
 * The built app behind Gatecrash's own production server (server/app.ts: security headers on everything,
 * compression, body limits, client address), as a Node request listener for supertest or http.createServer.
 * `npm test` builds into GATECRASH_BUILD_DIR.
 */
export async function builtListener(): Promise<RequestListener> {
  const dir = process.env.GATECRASH_BUILD_DIR;
  if (!dir) throw new Error("GATECRASH_BUILD_DIR is not set: run the tests through `npm test`");
  const build = (await import(/* @vite-ignore */ `${dir}/server/index.js`)) as ServerBuild;
  return createApp(build, `${dir}/client`, "production") as unknown as RequestListener;
}

/** The origin the app serves (APP_URL), as a browser on one of its pages would send it. */
export const appOrigin = (): string => new URL(process.env.APP_URL ?? "http://127.0.0.1:3000").origin;

/** The built app on a real loopback port (for tests that need real sockets: bursts, streamed bodies). */
export async function listenBuilt(): Promise<{ base: string; close(): Promise<void> }> {
  const { createServer } = await import("node:http");
  const server = createServer(await builtListener());
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.address() as import("node:net").AddressInfo;
  return {
    base: `http://127.0.0.1:${port}`,
    close: async () => {
      server.closeAllConnections();
      await new Promise((resolve) => server.close(resolve));
    },
  };
}
