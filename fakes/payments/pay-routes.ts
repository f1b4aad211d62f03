// The hosted page a Checkout Session's `url` points at: GET shows it, the two forms post back.
import type { IncomingMessage, ServerResponse } from "node:http";
import { ApiError } from "./errors";
import { NO_API_REQUEST } from "./events";
import { messagePage, paymentPage } from "./hosted-page";
import { readBody, redirectSeeOther, sendHtml } from "./http";
import type { Ledger } from "./ledger";
import type { StoredCheckoutSession } from "./types";

const PAGE_PATH = /^\/pay\/([^/]+)(?:\/(pay|cancel))?$/;

/** Stripe replaces the literal `{CHECKOUT_SESSION_ID}` in success_url with the session id. */
export function successRedirect(session: StoredCheckoutSession): string {
  return session.success_url.replaceAll("{CHECKOUT_SESSION_ID}", session.id);
}

function findSession(ledger: Ledger, id: string): StoredCheckoutSession | undefined {
  try {
    return ledger.storedSession(id);
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) return undefined;
    throw error;
  }
}

export function createPayHandler(ledger: Ledger) {
  return async function handlePay(request: IncomingMessage, response: ServerResponse, url: URL): Promise<void> {
    const match = PAGE_PATH.exec(url.pathname);
    const method = request.method ?? "GET";
    if (!match) {
      sendHtml(response, 404, messagePage("Page not found", "There is no payment page at this address."));
      return;
    }
    const [, rawId, action] = match;
    let sessionId = rawId;
    try {
      sessionId = decodeURIComponent(rawId);
    } catch {
      // A malformed id is simply an unknown one.
    }
    const session = findSession(ledger, sessionId);
    if (!session) {
      sendHtml(response, 404, messagePage("Payment not found", `No test payment has the reference ${sessionId}.`));
      return;
    }

    if (action === undefined) {
      if (method !== "GET" && method !== "HEAD") return methodNotAllowed(response);
      return showPage(response, session);
    }
    if (method !== "POST") return methodNotAllowed(response);
    await readBody(request); // The forms carry no fields; drain the body anyway.

    if (action === "cancel") {
      if (session.cancel_url) return redirectSeeOther(response, session.cancel_url);
      sendHtml(response, 200, messagePage("Payment cancelled", "Nothing was paid. You can close this page."));
      return;
    }
    if (session.status === "expired") {
      sendHtml(response, 409, messagePage("Payment page expired", "This test payment expired before it was paid. Start again from the app."));
      return;
    }
    const paid = ledger.paySession(session.id, NO_API_REQUEST);
    redirectSeeOther(response, successRedirect(paid));
  };
}

function showPage(response: ServerResponse, session: StoredCheckoutSession): void {
  if (session.status === "complete") {
    sendHtml(response, 200, messagePage("Already paid", "This test payment is already complete.", { href: successRedirect(session), label: "Back to the app" }));
  } else if (session.status === "expired") {
    sendHtml(response, 410, messagePage("Payment page expired", "This test payment expired before it was paid. Start again from the app."));
  } else {
    sendHtml(response, 200, paymentPage(session));
  }
}

function methodNotAllowed(response: ServerResponse): void {
  sendHtml(response, 405, messagePage("Not allowed", "Use the buttons on the payment page."));
}
