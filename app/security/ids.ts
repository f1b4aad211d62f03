import { z } from "zod";

/**
 * The one id check: every object id in a URL or a body is a UUID (RFC 9562, as zod's `uuid()` reads it). Anything
 * else cannot name an object, so lookups answer "not found" (404) instead of handing PostgreSQL a value its uuid
 * type rejects (a 500).
 */
const uuid = z.uuid();

export function isId(value: unknown): value is string {
  return typeof value === "string" && uuid.safeParse(value).success;
}
