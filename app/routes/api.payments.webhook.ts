import Stripe from "stripe";
import { apiError, apiJson, requireMethod } from "~/api/json.server";
import { env } from "~/env.server";
import { applyWebhookEvent } from "~/payments/service.server";
import { stripe } from "~/payments/stripe.server";
import type { Route } from "./+types/api.payments.webhook";

/**
 * The payment service's webhook. No session: the signature is the permission check, over the raw body.
 * A bad signature is a 400 and changes nothing; a repeated event is a 200 that changes nothing.
 */
export async function action({ request }: Route.ActionArgs) {
  requireMethod(request, ["POST"]);
  const raw = await request.text();
  const signature = request.headers.get("stripe-signature") ?? "";
  let event: Stripe.Event;
  try {
    event = stripe().webhooks.constructEvent(raw, signature, env().STRIPE_WEBHOOK_SECRET);
  } catch (e) {
    if (e instanceof Stripe.errors.StripeSignatureVerificationError) return apiError(400, "bad_signature", "The webhook signature does not verify.");
    throw e;
  }
  const outcome = await applyWebhookEvent(event);
  return apiJson({ received: true, outcome });
}
