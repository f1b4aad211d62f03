// The `expand[]` request parameter: replaces an id field by the object it names, with
// dotted paths (`payment_intent.latest_charge`) reaching further in.
import { invalidParam } from "./errors";
import type { Ledger } from "./ledger";

type Expander = (id: string, ledger: Ledger) => object;

const EXPANDABLE: Record<string, Record<string, Expander>> = {
  "checkout.session": { payment_intent: (id, ledger) => ledger.retrievePaymentIntent(id) },
  payment_intent: { latest_charge: (id, ledger) => ledger.retrieveCharge(id) },
  charge: { payment_intent: (id, ledger) => ledger.retrievePaymentIntent(id) },
  refund: {
    charge: (id, ledger) => ledger.retrieveCharge(id),
    payment_intent: (id, ledger) => ledger.retrievePaymentIntent(id),
  },
};

const MAX_EXPANSION_DEPTH = 4;

function expandPath(target: Record<string, unknown>, path: string[], fullPath: string, ledger: Ledger): Record<string, unknown> {
  const [field, ...rest] = path;
  const expander = EXPANDABLE[String(target.object)]?.[field];
  if (!expander) throw invalidParam("expand", `This property cannot be expanded (${fullPath}).`);
  const current = target[field];
  let expanded: unknown = current;
  if (typeof current === "string") expanded = expander(current, ledger);
  const result: Record<string, unknown> = { ...target, [field]: expanded };
  // A null field (e.g. an unpaid session's payment_intent) stays null, as in the real API.
  if (rest.length > 0 && expanded !== null && typeof expanded === "object") {
    result[field] = expandPath(expanded as Record<string, unknown>, rest, fullPath, ledger);
  }
  return result;
}

export function applyExpansions<T extends object>(object: T, paths: string[], ledger: Ledger): T {
  let result = object as unknown as Record<string, unknown>;
  for (const path of paths) {
    const segments = path.split(".");
    if (segments.length > MAX_EXPANSION_DEPTH) {
      throw invalidParam("expand", `You cannot expand more than ${MAX_EXPANSION_DEPTH} levels of a property (${path}).`);
    }
    result = expandPath(result, segments, path, ledger);
  }
  return result as unknown as T;
}

/** Refuses an expansion whose first step the returned object type does not offer. */
export function checkExpandable(objectType: string, paths: string[]): void {
  for (const path of paths) {
    const field = path.split(".")[0];
    if (!EXPANDABLE[objectType]?.[field]) throw invalidParam("expand", `This property cannot be expanded (${path}).`);
  }
}
