import Stripe from "stripe";
import { readJsonText } from "~/api/body.server";
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
  const raw = await readJsonText(request);
  const signature = request.headers.get("stripe-signature") ?? "";
  let event: Stripe.Event;
  try {
    event = stripe().webhooks.constructEvent(raw, signature, env().STRIPE_WEBHOOK_SECRET);
  } catch (e) {
    if (e instanceof Stripe.errors.StripeSignatureVerificationError) return apiError(400, "bad_signature", "The webhook signature does not verify.");
    // The signature verified, then the body did not parse: the sender's fault, said as such.
    if (e instanceof SyntaxError) return apiError(400, "invalid_json", "The webhook body is not valid JSON.");
    throw e;
  }
  const outcome = await applyWebhookEvent(event);
  return apiJson({ received: true, outcome });
}
