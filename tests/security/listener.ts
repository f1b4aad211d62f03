import { createRequestListener } from "@react-router/node";
import type { ServerBuild } from "react-router";
import type { RequestListener } from "node:http";

/** The built app as a Node request listener (`npm test` builds into GATECRASH_BUILD_DIR), for supertest. */
export async function builtListener(): Promise<RequestListener> {
  const dir = process.env.GATECRASH_BUILD_DIR;
  if (!dir) throw new Error("GATECRASH_BUILD_DIR is not set: run the tests through `npm test`");
  const build = (await import(/* @vite-ignore */ `${dir}/server/index.js`)) as ServerBuild;
  return createRequestListener({ build, mode: "production" });
}

/** The origin the app serves (APP_URL), as a browser on one of its pages would send it. */
export const appOrigin = (): string => new URL(process.env.APP_URL ?? "http://127.0.0.1:3000").origin;
