import { join } from "node:path";
import { createReadableStreamFromReadable, writeReadableStreamToWritable } from "@react-router/node";
import compression from "compression";
import express, { type NextFunction, type Request, type Response } from "express";
import onHeaders from "on-headers";
import { createRequestHandler, RouterContextProvider, type RouterContext, type ServerBuild } from "react-router";
import { env } from "~/env.server";
import { applySecurityHeaders, newNonce } from "~/security/headers.server";
import { bodyLimit } from "./body-limit";

/**
 * Gatecrash's own web server for the production build (`npm start`, `npm test`, any deployment): Express with
 * the framework's request handler, and around it what the framework leaves to the server —
 * - the security headers on every response, static files included (a route's own headers win: pages carry the
 *   per-request nonce from the root middleware, the SVG artifact its `default-src 'none'`);
 * - compression;
 * - body limits while bodies stream (./body-limit.ts);
 * - the client address, from the socket unless TRUSTED_PROXIES names the proxy in front (then from its
 *   X-Forwarded-For), handed to the app for per-address rate limits.
 */
export interface BuildEntryExtras {
  clientAddressContext: RouterContext<string | null>;
  closeServerResources(): Promise<void>;
}

/**
 * The framework's request handler on Express. (Not @react-router/express: the handler checks the load context
 * with `instanceof`, and that adapter's CommonJS copy of react-router is not the copy this server's context comes
 * from; here the handler and the context come from the one import above.)
 */
function frameworkHandler(build: ServerBuild, mode: string, contextFor: (req: Request) => RouterContextProvider) {
  const handle = createRequestHandler(build, mode);
  return async (req: Request, res: Response, next: NextFunction) => {
    try {
      const controller = new AbortController();
      res.on("close", () => {
        if (!res.writableFinished) controller.abort();
      });
      const headers = new Headers();
      for (const [name, value] of Object.entries(req.headers)) {
        if (value === undefined) continue;
        for (const v of Array.isArray(value) ? value : [value]) headers.append(name, v);
      }
      const init: RequestInit & { duplex?: "half" } = { method: req.method, headers, signal: controller.signal };
      if (req.method !== "GET" && req.method !== "HEAD") {
        init.body = createReadableStreamFromReadable(req);
        init.duplex = "half";
      }
      const response = await handle(new globalThis.Request(`${req.protocol}://${req.get("host") ?? "localhost"}${req.originalUrl}`, init), contextFor(req));
      if (res.destroyed || res.writableEnded) return void (await response.body?.cancel());
      res.statusMessage = response.statusText;
      res.status(response.status);
      for (const [name, value] of response.headers) res.append(name, value);
      if (response.body) await writeReadableStreamToWritable(response.body, res);
      else res.end();
    } catch (e) {
      next(e);
    }
  };
}

export function entryExtras(build: ServerBuild): BuildEntryExtras {
  return build.entry.module as unknown as BuildEntryExtras;
}

function securityHeadersOnEverything(_req: Request, res: Response, next: NextFunction): void {
  onHeaders(res, function fill() {
    const headers = new Headers();
    applySecurityHeaders(headers, newNonce());
    // Never a policy on a 304: the page the client keeps has its own nonce (see app/security/middleware.server.ts).
    if (res.statusCode === 304) headers.delete("Content-Security-Policy");
    for (const [name, value] of headers) if (!res.hasHeader(name)) res.setHeader(name, value);
  });
  next();
}

export function createApp(build: ServerBuild, clientDir: string, mode = process.env.NODE_ENV ?? "production"): express.Express {
  const extras = entryExtras(build);
  const app = express();
  app.disable("x-powered-by");
  const proxies = env().TRUSTED_PROXIES;
  app.set("trust proxy", proxies.length ? proxies : false);
  app.use(securityHeadersOnEverything);
  app.use(compression());
  // Fingerprinted build assets never change; everything else in public/ may.
  app.use("/assets", express.static(join(clientDir, "assets"), { immutable: true, maxAge: "1y", index: false }));
  app.use(express.static(clientDir, { maxAge: "1h", index: false }));
  app.use(bodyLimit);
  app.all(
    "*",
    frameworkHandler(build, mode, (req) => {
      const context = new RouterContextProvider();
      context.set(extras.clientAddressContext, req.ip ?? null);
      return context;
    }),
  );
  // After a response has gone out (a 413 while the app still read), a late error has nobody to tell: drop the socket.
  app.use((err: unknown, req: Request, res: Response, next: NextFunction) => {
    if (res.headersSent) {
      req.socket.destroy();
      return;
    }
    next(err);
  });
  return app;
}
