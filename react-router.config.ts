import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  // `npm test` builds into its own folder so it never swaps the files under a running `npm start`.
  buildDirectory: process.env.GATECRASH_BUILD_DIR ?? "build",
} satisfies Config;
