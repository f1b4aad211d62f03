import { PassThrough } from "node:stream";
import type { EntryContext, RouterContextProvider } from "react-router";
import { createReadableStreamFromReadable } from "@react-router/node";
import { ServerRouter } from "react-router";
import { isbot } from "isbot";
import type { RenderToPipeableStreamOptions } from "react-dom/server";
import { renderToPipeableStream } from "react-dom/server";
import { closeDb } from "./db/client.server";
import { stopQueue } from "./jobs/queue.server";
import { clientAddressContext, nonceContext, publicPageContext } from "./security/context";
import { ifNoneMatchMatches, notModified, strongEtag } from "./security/conditional";
import { PLACEHOLDER_NONCE, renderedOnce, withNonce } from "./security/public-page.server";
import { createHash } from "node:crypto";

/** For Gatecrash's own server (server/app.ts), which puts the client's address into each request's context. */
export { clientAddressContext };

/** For a graceful stop (server/main.ts): the queue client and the database pool of this process. */
export async function closeServerResources(): Promise<void> {
  await stopQueue();
  await closeDb();
}

/**
 * Renders pages as a stream (bots and SPA mode wait for all content). The CSP nonce comes from the root
 * middleware (app/security/middleware.server.ts) through the router context; ServerRouter hands it on to
 * <Scripts>, <ScrollRestoration> and <Links>, and React puts it on the inline scripts it streams.
 */
export const streamTimeout = 5_000;

export default function handleRequest(
  request: Request,
  responseStatusCode: number,
  responseHeaders: Headers,
  routerContext: EntryContext,
  loadContext: RouterContextProvider,
) {
  if (request.method.toUpperCase() === "HEAD") {
    return new Response(null, { status: responseStatusCode, headers: responseHeaders });
  }
  const nonce = loadContext.get(nonceContext) || undefined;
  const publicVersion = loadContext.get(publicPageContext);
  if (publicVersion !== null && responseStatusCode === 200 && nonce) {
    // A page that fails to render whole is not kept: it is streamed as any other, which reports its error.
    return publicPage(request, publicVersion, responseHeaders, routerContext, nonce).catch(() => streamPage(request, responseStatusCode, responseHeaders, routerContext, nonce));
  }
  return streamPage(request, responseStatusCode, responseHeaders, routerContext, nonce);
}

function streamPage(request: Request, responseStatusCode: number, responseHeaders: Headers, routerContext: EntryContext, nonce: string | undefined): Promise<Response> {
  return new Promise<Response>((resolve, reject) => {
    let shellRendered = false;
    const userAgent = request.headers.get("user-agent");
    const readyOption: keyof RenderToPipeableStreamOptions = (userAgent && isbot(userAgent)) || routerContext.isSpaMode ? "onAllReady" : "onShellReady";
    let timeoutId: ReturnType<typeof setTimeout> | undefined = setTimeout(() => abort(), streamTimeout + 1000);

    const { pipe, abort } = renderToPipeableStream(<ServerRouter context={routerContext} url={request.url} nonce={nonce} />, {
      nonce,
      [readyOption]() {
        shellRendered = true;
        const body = new PassThrough({
          final(callback) {
            clearTimeout(timeoutId);
            timeoutId = undefined;
            callback();
          },
        });
        const stream = createReadableStreamFromReadable(body);
        responseHeaders.set("Content-Type", "text/html");
        pipe(body);
        resolve(new Response(stream, { headers: responseHeaders, status: responseStatusCode }));
      },
      onShellError(error: unknown) {
        reject(error);
      },
      onError(error: unknown) {
        responseStatusCode = 500;
        if (shellRendered) console.error(error);
      },
    });
  });
}

/**
 * A public page (its loader called markPublicPage): the ETag names the page's address, the version of what it
 * shows and the build; a client holding it gets 304, anyone else the page rendered once for that ETag with this
 * response's nonce. `no-cache` makes every cache ask again each time, so a new version shows at once.
 */
async function publicPage(request: Request, version: string, responseHeaders: Headers, routerContext: EntryContext, nonce: string): Promise<Response> {
  const headers = new Headers(responseHeaders);
  const url = new URL(request.url);
  const tag = createHash("sha256").update(`${url.pathname}${url.search}\0${version}\0${routerContext.manifest.version}`).digest("base64url").slice(0, 32);
  const etag = strongEtag(tag);
  headers.set("ETag", etag);
  headers.set("Cache-Control", "public, no-cache");
  headers.set("Vary", "Cookie");
  if (ifNoneMatchMatches(request.headers.get("If-None-Match"), etag)) return notModified(etag, headers);
  const html = await renderedOnce(tag, () => renderWhole(request, routerContext, PLACEHOLDER_NONCE));
  headers.set("Content-Type", "text/html");
  return new Response(withNonce(html, nonce), { status: 200, headers });
}

/** The whole document as one string (every Suspense boundary resolved), for keeping. */
function renderWhole(request: Request, routerContext: EntryContext, nonce: string): Promise<string> {
  return new Promise<string>((resolve, reject) => {
    const chunks: Buffer[] = [];
    const sink = new PassThrough();
    sink.on("data", (c: Buffer) => chunks.push(c));
    sink.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    sink.on("error", reject);
    let failed = false;
    const { pipe, abort } = renderToPipeableStream(<ServerRouter context={routerContext} url={request.url} nonce={nonce} />, {
      nonce,
      onAllReady() {
        if (!failed) pipe(sink);
      },
      onShellError(error: unknown) {
        reject(error);
      },
      onError(error: unknown) {
        // An error inside the page: not kept; the normal path renders it again and reports it.
        failed = true;
        reject(error);
      },
    });
    setTimeout(() => abort(), streamTimeout + 1000).unref();
  });
}
