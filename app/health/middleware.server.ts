import { data, type MiddlewareFunction } from "react-router";
import { apiError } from "~/api/json.server";
import { poolPressure } from "~/db/client.server";
import { DATABASE_AWAY_MESSAGE, databaseAnswers } from "./database.server";
import { STORAGE_AWAY_MESSAGE, storageAnswers } from "./storage.server";

/**
 * Root middleware: when a request fails with a server error, probe PostgreSQL and then the object store. If one of
 * them does not answer, the answer becomes a 503 — the API error shape under /api (`database_unavailable`,
 * `storage_unavailable`), the root ErrorBoundary's "catching its breath" page elsewhere — with Retry-After (set by
 * the security-headers middleware around it). Nothing is cached: once the service is back, the next request works
 * (postgres.js and the S3 client reconnect by themselves). A request whose transaction found no free pool
 * connection in time is a 503 `database_busy` with Retry-After, without a probe.
 */
export const databaseAway: MiddlewareFunction<Response> = async ({ request }, next) => {
  const pressure = { busy: false };
  // A resource route's failure (a middleware below that could not read the session, say) arrives as a rejection.
  const res = await poolPressure.run(pressure, next).catch(async (e: unknown) => {
    if (pressure.busy || !(await databaseAnswers())) return new Response(null, { status: 500 });
    throw e;
  });
  if (res.status < 500 || res.status === 503) return res;
  const isApi = new URL(request.url).pathname.startsWith("/api/");
  // A transaction of this request found no free connection in time (app/db/client.server.ts): busy, not broken.
  if (pressure.busy) {
    if (isApi) return withRetryAfter(apiError(503, "database_busy", DATABASE_BUSY_MESSAGE), BUSY_RETRY_SECONDS);
    throw data({ message: DATABASE_BUSY_MESSAGE }, { status: 503, headers: { "Retry-After": String(BUSY_RETRY_SECONDS) } });
  }
  const dbUp = await databaseAnswers();
  const storageUp = dbUp ? await storageAnswers() : true;
  if (dbUp && storageUp) return res;
  const [code, message] = dbUp ? ["storage_unavailable", STORAGE_AWAY_MESSAGE] : ["database_unavailable", DATABASE_AWAY_MESSAGE];
  if (isApi) return apiError(503, code, message);
  throw data({ message }, { status: 503 });
};

const BUSY_RETRY_SECONDS = 2;
const DATABASE_BUSY_MESSAGE = "Gatecrash is very busy right now and could not finish this in time. Nothing was changed; try again in a moment.";

function withRetryAfter(res: Response, seconds: number): Response {
  res.headers.set("Retry-After", String(seconds));
  return res;
}
