// Object ids with Stripe's prefixes (cs_test_, pi_, ch_, re_, evt_ …) and a random tail.
import { randomBytes } from "node:crypto";

const ALPHABET = "0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz";

export function newId(prefix: string, length = 24): string {
  const bytes = randomBytes(length);
  let tail = "";
  // 62 does not divide 256, so the spread is marginally uneven; ids only need to be unique.
  for (const byte of bytes) tail += ALPHABET[byte % ALPHABET.length];
  return `${prefix}_${tail}`;
}
