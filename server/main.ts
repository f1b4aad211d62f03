/**
 * Starts the production server: `node --import tsx server/main.ts [BUILD_DIR]` (npm start and npm test run it).
 * Settings are validated before it listens (in production a missing or default secret stops it here, naming the
 * variable). SIGTERM or SIGINT: stop taking connections, let requests in flight finish (up to SHUTDOWN_GRACE_MS),
 * then close the database pool and the queue client, and exit.
 */
import { createServer } from "node:http";
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";
import type { ServerBuild } from "react-router";
import { env } from "~/env.server";
import { createApp, entryExtras } from "./app";

const SHUTDOWN_GRACE_MS = Number(process.env.SHUTDOWN_GRACE_MS ?? 10_000);

async function main(): Promise<void> {
  try {
    env();
  } catch (e) {
    console.error(e instanceof Error ? e.message : e);
    process.exit(1);
  }
  const buildDir = resolve(process.argv[2] ?? process.env.GATECRASH_BUILD_DIR ?? "build");
  const build = (await import(pathToFileURL(`${buildDir}/server/index.js`).href)) as ServerBuild;
  const app = createApp(build, `${buildDir}/client`);
  const port = Number(process.env.PORT ?? 3000);
  const host = process.env.HOST ?? "127.0.0.1";
  const server = createServer(app);
  server.keepAliveTimeout = 5_000;
  await new Promise<void>((ok) => server.listen(port, host, ok));
  console.log(`Gatecrash web server on http://${host}:${port}`);

  let stopping = false;
  const stop = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    console.log(`${signal}: finishing requests in flight, then closing the database pool`);
    const force = setTimeout(() => server.closeAllConnections(), SHUTDOWN_GRACE_MS);
    force.unref();
    const closed = new Promise<void>((ok) => server.close(() => ok()));
    server.closeIdleConnections();
    await closed;
    clearTimeout(force);
    await entryExtras(build).closeServerResources();
    console.log("stopped");
    process.exit(0);
  };
  process.on("SIGTERM", () => void stop("SIGTERM"));
  process.on("SIGINT", () => void stop("SIGINT"));
}

void main();
