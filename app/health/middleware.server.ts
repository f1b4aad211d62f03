import { data, type MiddlewareFunction } from "react-router";
import { apiError } from "~/api/json.server";
import { DATABASE_AWAY_MESSAGE, databaseAnswers } from "./database.server";
import { STORAGE_AWAY_MESSAGE, storageAnswers } from "./storage.server";

/**
 * Root middleware: when a request fails with a server error, probe PostgreSQL and then the object store. If one of
 * them does not answer, the answer becomes a 503 — the API error shape under /api (`database_unavailable`,
 * `storage_unavailable`), the root ErrorBoundary's "catching its breath" page elsewhere — with Retry-After (set by
 * the security-headers middleware around it). Nothing is cached: once the service is back, the next request works
 * (postgres.js and the S3 client reconnect by themselves).
 */
export const databaseAway: MiddlewareFunction<Response> = async ({ request }, next) => {
  const res = await next();
  if (res.status < 500 || res.status === 503) return res;
  const dbUp = await databaseAnswers();
  const storageUp = dbUp ? await storageAnswers() : true;
  if (dbUp && storageUp) return res;
  const [code, message] = dbUp ? ["storage_unavailable", STORAGE_AWAY_MESSAGE] : ["database_unavailable", DATABASE_AWAY_MESSAGE];
  if (new URL(request.url).pathname.startsWith("/api/")) return apiError(503, code, message);
  throw data({ message }, { status: 503 });
};
