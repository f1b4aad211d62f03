// Stripe's webhook signature scheme: header `t=TIMESTAMP,v1=HEX`, where HEX is the
// HMAC-SHA256 of "TIMESTAMP.PAYLOAD" keyed with the endpoint secret string as given.
import { createHmac } from "node:crypto";

export function signatureHeader(payload: string, secret: string, timestampSeconds: number): string {
  const digest = createHmac("sha256", secret).update(`${timestampSeconds}.${payload}`, "utf8").digest("hex");
  return `t=${timestampSeconds},v1=${digest}`;
}
