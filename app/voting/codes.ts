import { createHmac, randomInt, timingSafeEqual } from "node:crypto";

/**
 * Vote codes for people in the hall: 8 characters from an alphabet without look-alikes (no 0/O, 1/I/L),
 * printed as two groups of four ("KX7M-Q2HD"). 31^8 ≈ 8.5·10^11 codes (≈ 39.6 bits) and a rate limit on
 * failed attempts make guessing hopeless; a code is typed in at most once.
 */
export const CODE_ALPHABET = "ABCDEFGHJKMNPQRSTUVWXYZ23456789";
export const CODE_LENGTH = 8;

export function generateCode(): string {
  let s = "";
  for (let i = 0; i < CODE_LENGTH; i++) s += CODE_ALPHABET[randomInt(CODE_ALPHABET.length)];
  return formatCode(s);
}

export function formatCode(compact: string): string {
  return `${compact.slice(0, 4)}-${compact.slice(4)}`;
}

/** What a person typed → the stored form, or null when it cannot be a code. Lower case, spaces and dashes are fine. */
export function normaliseCode(input: string): string | null {
  const compact = input.toUpperCase().replace(/[\s\-_.]/g, "");
  if (compact.length !== CODE_LENGTH) return null;
  for (const ch of compact) if (!CODE_ALPHABET.includes(ch)) return null;
  return formatCode(compact);
}

/**
 * The proof a browser keeps after redeeming a code in one compo, so the same holder can change that ballot until
 * close while nobody else can use the code there again: an HMAC over the code's id, the compo and the moment it
 * was redeemed there (known only to the server and to the browser that redeemed it). A party-wide code is
 * redeemed once per compo, so each compo has its own token.
 */
export function codeHolderToken(secret: string, codeId: string, competitionId: string, redeemedAt: Date): string {
  const mac = createHmac("sha256", secret).update(`vote-code:${codeId}:${competitionId}:${redeemedAt.getTime()}`).digest("base64url");
  return `${codeId}.${mac}`;
}

export function readCodeHolderToken(token: string): { codeId: string; mac: string } | null {
  const i = token.indexOf(".");
  if (i <= 0) return null;
  return { codeId: token.slice(0, i), mac: token.slice(i + 1) };
}

export function tokenMatches(secret: string, token: string, codeId: string, competitionId: string, redeemedAt: Date): boolean {
  const a = Buffer.from(token);
  const b = Buffer.from(codeHolderToken(secret, codeId, competitionId, redeemedAt));
  return a.length === b.length && timingSafeEqual(a, b);
}
