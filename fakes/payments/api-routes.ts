// The `/v1` REST surface: authentication, form parsing, idempotency, routing and expansion.
import type { IncomingMessage, ServerResponse } from "node:http";
import { timingSafeEqual } from "node:crypto";
import { ApiError, resourceMissing } from "./errors";
import type { EventLog, RequestOrigin } from "./events";
import { applyExpansions, checkExpandable } from "./expand";
import { parseFormBody, parseFormQuery, type FormObject } from "./form";
import { readBody, sendJson, isFormContentType } from "./http";
import { IdempotencyCache, requestFingerprint } from "./idempotency";
import { newId } from "./ids";
import type { Ledger } from "./ledger";
import { Params } from "./params";

interface RouteContext {
  params: Params;
  pathIds: string[];
  origin: RequestOrigin;
}

interface Route {
  method: "GET" | "POST";
  pattern: RegExp;
  /** The `object` value of what the route returns, so `expand[]` is checked before any work. */
  returns: string;
  run: (context: RouteContext) => object;
}

export interface ApiDependencies {
  ledger: Ledger;
  events: EventLog;
  idempotency: IdempotencyCache;
  secretKey: string;
}

function routes({ ledger, events }: ApiDependencies): Route[] {
  const noParams = (params: Params): void => params.rejectUnknown([]);
  return [
    {
      method: "POST",
      pattern: /^\/v1\/checkout\/sessions$/,
      returns: "checkout.session",
      run: ({ params }) => ledger.createCheckoutSession(params),
    },
    {
      method: "GET",
      pattern: /^\/v1\/checkout\/sessions\/([^/]+)$/,
      returns: "checkout.session",
      run: ({ params, pathIds }) => (noParams(params), ledger.retrieveSession(pathIds[0])),
    },
    {
      method: "POST",
      pattern: /^\/v1\/checkout\/sessions\/([^/]+)\/expire$/,
      returns: "checkout.session",
      run: ({ params, pathIds, origin }) => (noParams(params), ledger.expireSession(pathIds[0], origin)),
    },
    {
      method: "GET",
      pattern: /^\/v1\/payment_intents\/([^/]+)$/,
      returns: "payment_intent",
      run: ({ params, pathIds }) => (noParams(params), ledger.retrievePaymentIntent(pathIds[0])),
    },
    {
      method: "GET",
      pattern: /^\/v1\/charges\/([^/]+)$/,
      returns: "charge",
      run: ({ params, pathIds }) => (noParams(params), ledger.retrieveCharge(pathIds[0])),
    },
    {
      method: "POST",
      pattern: /^\/v1\/refunds$/,
      returns: "refund",
      run: ({ params, origin }) => ledger.createRefund(params, origin),
    },
    {
      method: "GET",
      pattern: /^\/v1\/refunds\/([^/]+)$/,
      returns: "refund",
      run: ({ params, pathIds }) => (noParams(params), ledger.retrieveRefund(pathIds[0])),
    },
    {
      method: "GET",
      pattern: /^\/v1\/events\/([^/]+)$/,
      returns: "event",
      run: ({ params, pathIds }) => {
        noParams(params);
        const event = events.retrieve(pathIds[0]);
        if (!event) throw resourceMissing("event", pathIds[0]);
        return event;
      },
    },
  ];
}

/** The API key from `Authorization: Bearer KEY` or HTTP Basic with the key as user name. */
function presentedKey(request: IncomingMessage): string | undefined {
  const header = request.headers.authorization;
  if (!header) return undefined;
  const [scheme, value = ""] = header.split(/\s+/, 2);
  if (scheme.toLowerCase() === "bearer") return value;
  if (scheme.toLowerCase() === "basic") return Buffer.from(value, "base64").toString("utf8").split(":")[0];
  return "";
}

function sameSecret(presented: string, expected: string): boolean {
  const a = Buffer.from(presented);
  const b = Buffer.from(expected);
  return a.length === b.length && timingSafeEqual(a, b);
}

function authenticate(request: IncomingMessage, secretKey: string): void {
  const key = presentedKey(request);
  if (key === undefined || key === "") {
    throw new ApiError(401, "authentication_error", "No API key provided. Send it as 'Authorization: Bearer sk_test_…'.");
  }
  if (!sameSecret(key, secretKey)) {
    const hint = key.length > 4 ? `…${key.slice(-4)}` : "…";
    throw new ApiError(401, "authentication_error", `Invalid API key provided: ${hint}`);
  }
}

export function createApiHandler(dependencies: ApiDependencies) {
  const table = routes(dependencies);

  return async function handleApi(request: IncomingMessage, response: ServerResponse, url: URL): Promise<void> {
    const requestId = newId("req", 14);
    const reply = (status: number, body: string, extra: Record<string, string> = {}): void =>
      sendJson(response, status, body, { "Request-Id": requestId, ...extra });
    try {
      authenticate(request, dependencies.secretKey);
      const method = request.method ?? "GET";
      const route = table.find((candidate) => candidate.method === method && candidate.pattern.test(url.pathname));
      if (!route) {
        throw new ApiError(404, "invalid_request_error", `Unrecognized request URL (${method}: ${url.pathname}). The local payments fake serves only a small part of the API; see fakes/payments/README.md.`);
      }

      let data: FormObject;
      if (method === "POST") {
        if (!isFormContentType(request)) {
          throw new ApiError(400, "invalid_request_error", "Request bodies must be sent as application/x-www-form-urlencoded.");
        }
        data = parseFormBody(await readBody(request));
      } else {
        data = parseFormQuery(url.search);
      }

      const idempotencyKey = method === "POST" ? headerValue(request, "idempotency-key") : undefined;
      const fingerprint = requestFingerprint(method, url.pathname, data);
      if (idempotencyKey !== undefined) {
        IdempotencyCache.validateKey(idempotencyKey);
        const saved = dependencies.idempotency.lookup(idempotencyKey, fingerprint);
        if (saved) {
          reply(saved.status, saved.body, { "Idempotent-Replayed": "true", "Idempotency-Key": idempotencyKey });
          return;
        }
      }

      const { expand, ...rest } = data;
      const expandPaths = new Params({ expand: expand ?? "" }).optionalStringArray("expand");
      checkExpandable(route.returns, expandPaths);
      const pathIds = (route.pattern.exec(url.pathname) ?? []).slice(1).map(decodePathSegment);
      const result = route.run({
        params: new Params(rest),
        pathIds,
        origin: { requestId, idempotencyKey: idempotencyKey ?? null },
      });
      const body = JSON.stringify(applyExpansions(result, expandPaths, dependencies.ledger), null, 2);
      // Saved only once the work is done: requests refused by validation may be retried with the same key.
      if (idempotencyKey !== undefined) dependencies.idempotency.remember(idempotencyKey, fingerprint, 200, body);
      reply(200, body, idempotencyKey === undefined ? {} : { "Idempotency-Key": idempotencyKey });
    } catch (error) {
      const apiError =
        error instanceof ApiError
          ? error
          : (console.error("payments fake: unexpected failure", error),
            new ApiError(500, "api_error", "The local payments fake failed unexpectedly; its console has the details."));
      reply(apiError.status, JSON.stringify(apiError.toBody(), null, 2));
    }
  };
}

function headerValue(request: IncomingMessage, name: string): string | undefined {
  const value = request.headers[name];
  return Array.isArray(value) ? value[0] : value;
}

function decodePathSegment(segment: string): string {
  try {
    return decodeURIComponent(segment);
  } catch {
    // A malformed escape cannot name any object; let the lookup report it as missing.
    return segment;
  }
}
