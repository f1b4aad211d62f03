/**
 * How many bytes a request body may have, per route. No route of Gatecrash receives a file: uploads go straight
 * from the browser to the object store through presigned URLs, so every body here is a small form or JSON
 * document. Shared by the production server (server/body-limit.ts: Content-Length first, then a count while the
 * body streams) and the readers every route uses (app/api/body.server.ts).
 */
const KIB = 1024;

export const DEFAULT_BODY_LIMIT = 64 * KIB;

const LIMITS: { path: RegExp; bytes: number; why: string }[] = [
  { path: /^\/api\/payments\/webhook$/, bytes: 512 * KIB, why: "a payment service event with its object" },
  { path: /^\/organize\/[^/]+\/edit(\.data)?$/, bytes: 1024 * KIB, why: "the ruleset editor, which can import a ruleset JSON file" },
  { path: /^\/organize\/[^/]+\/jury(\.data)?$/, bytes: 256 * KIB, why: "a list of judges' e-mail addresses" },
  { path: /^\/organize\/events\/[^/]+\/competitions\/new(\.data)?$/, bytes: 256 * KIB, why: "a new compo with its criteria" },
];

export function bodyLimitFor(pathname: string): number {
  return LIMITS.find((l) => l.path.test(pathname))?.bytes ?? DEFAULT_BODY_LIMIT;
}

export function tooLargeMessage(limit: number): string {
  return `The request body is larger than this page accepts (${Math.round(limit / KIB)} KiB). Nothing was changed.`;
}
