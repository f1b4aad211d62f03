import { data, type MiddlewareFunction } from "react-router";
import { apiError } from "~/api/json.server";
import { DATABASE_AWAY_MESSAGE, databaseAnswers } from "./database.server";

/**
 * Root middleware: when a request fails with a server error and PostgreSQL does not answer a probe, the answer
 * becomes a 503 — the API error shape under /api, the root ErrorBoundary's "catching its breath" page elsewhere —
 * with Retry-After (set by the security-headers middleware around it). Nothing is cached: once the database is back, the next request works (postgres.js reconnects).
 */
export const databaseAway: MiddlewareFunction<Response> = async ({ request }, next) => {
  const res = await next();
  if (res.status < 500 || res.status === 503) return res;
  if (await databaseAnswers()) return res;
  if (new URL(request.url).pathname.startsWith("/api/")) {
    const out = apiError(503, "database_unavailable", DATABASE_AWAY_MESSAGE);
    out.headers.set("Retry-After", "5");
    return out;
  }
  throw data({ message: DATABASE_AWAY_MESSAGE }, { status: 503 });
};
