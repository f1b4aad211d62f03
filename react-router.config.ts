import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  future: {
    // Server middleware on the root route: security headers, CSP nonce, same-origin mutations (app/security).
    v8_middleware: true,
    // Adopted: it splits a route's client-only exports (clientLoader, clientAction, HydrateFallback) into their
    // own chunks. No route has any, so the build is the same; a route that gains one gets the smaller chunk.
    v8_splitRouteModules: true,
    // Adopted: the plugin builds the client and server through Vite's Environment API, which Vite 8 (pinned in
    // STACK.md) is made for; the output is laid out as before (client/, server/index.js).
    v8_viteEnvironmentApi: true,
    // Declined for now: loaders and actions would get the raw request, whose URL on a client navigation ends in
    // `.data` and carries `_routes`/`index` parameters. app/security (body limits per route, the same-origin rule)
    // and the `?next=` redirects read `request.url` as the page's own URL; they move to the normalized `url`
    // argument first, then this flag can go on.
    v8_passThroughRequests: false,
    // Declined for now: it changes the data URL of a path ending in "/" (`/a/_.data` instead of `/a.data`). No route
    // of ours ends in a slash, but the browser suite watches `.data` requests (tests/e2e/a11y-csp.e2e.test.ts);
    // adopt it together with v8_passThroughRequests and one run of the browser suite.
    v8_trailingSlashAwareDataRequests: false,
  },
  // The root middleware's same-origin rule (app/security/origin.server.ts) covers every mutation, resource routes
  // and Referer-only requests included, and answers 403 with the error page; the framework's narrower built-in
  // Origin check would answer a bare 400 before it, so it is handed over to the middleware.
  allowedActionOrigins: ["**"],
  // `npm test` builds into its own folder so it never swaps the files under a running `npm start`.
  buildDirectory: process.env.GATECRASH_BUILD_DIR ?? "build",
} satisfies Config;
