import Stripe from "stripe";
import { env } from "~/env.server";

/** The payment service through the real SDK (the local fake in development and tests). */
let client: Stripe | undefined;
export function stripe(): Stripe {
  const e = env();
  client ??= new Stripe(e.STRIPE_SECRET_KEY, { host: e.STRIPE_API_HOST, port: e.STRIPE_API_PORT, protocol: e.STRIPE_API_PROTOCOL });
  return client;
}
