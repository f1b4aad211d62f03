import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  // Server middleware on the root route: security headers, CSP nonce, same-origin mutations (app/security).
  future: { v8_middleware: true },
  // The root middleware's same-origin rule (app/security/origin.server.ts) covers every mutation, resource routes
  // and Referer-only requests included, and answers 403 with the error page; the framework's narrower built-in
  // Origin check would answer a bare 400 before it, so it is handed over to the middleware.
  allowedActionOrigins: ["**"],
  // `npm test` builds into its own folder so it never swaps the files under a running `npm start`.
  buildDirectory: process.env.GATECRASH_BUILD_DIR ?? "build",
} satisfies Config;
