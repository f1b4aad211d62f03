import { and, eq, inArray } from "drizzle-orm";
import { z } from "zod";
import { zonedWallTimeToUtc } from "~/competitions/timezone";
import { checkOfUpload } from "~/conformance/report.server";
import { db } from "~/db/client.server";
import { competitions, entries, uploads } from "~/db/schema";
import type { Ruleset } from "~/rules/ruleset";
import { compareChecks, type UploadComparison } from "./compare";
import { timelinessOf, uploadWindowOpen } from "./deadline";
import { AppError } from "~/errors/app-error";
import { chooseFinalUpload } from "./final-choice.server";
import { grantLateException, lateExceptionOf, revokeLateException } from "./late-exception.server";

/** The entry page's parts beyond the upload list: final pick, comparison, late exception, what the panel needs. */
type EntryRow = typeof entries.$inferSelect;
type CompetitionRow = typeof competitions.$inferSelect;

export async function entryPageExtras(entry: EntryRow, competition: CompetitionRow, ruleset: Ruleset, url: URL, now = new Date()) {
  const when = timelinessOf(now, competition.deadlineAt, competition.graceMinutes, entry.lateUntil);
  const acceptsUploads = uploadWindowOpen(competition.state, entry.state, when);
  return {
    acceptsUploads,
    /** The crew may still pick which upload is judged. */
    canChoose: acceptsUploads,
    lateException: await lateExceptionOf(entry.id),
    comparison: await comparisonFrom(entry.id, url),
    panel: { repositoryAllowed: ruleset.repository.allowed, licenceRequired: ruleset.licence.required, openLicencesOnly: ruleset.licence.openOnly },
  };
}

/** `?a=1&b=2` on the entry page: uploads #1 and #2 side by side. */
async function comparisonFrom(entryId: string, url: URL): Promise<UploadComparison | null> {
  const a = Number(url.searchParams.get("a"));
  const b = Number(url.searchParams.get("b"));
  if (!Number.isInteger(a) || !Number.isInteger(b) || a < 1 || b < 1 || a === b) return null;
  const rows = await db()
    .select({ id: uploads.id, number: uploads.number })
    .from(uploads)
    .where(and(eq(uploads.entryId, entryId), inArray(uploads.number, [a, b]), inArray(uploads.state, ["complete", "late"])));
  const ua = rows.find((r) => r.number === a);
  const ub = rows.find((r) => r.number === b);
  if (!ua || !ub) return null;
  return compareChecks(await checkOfUpload(ua.id, ua.number), await checkOfUpload(ub.id, ub.number));
}

const intents = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("pay") }),
  z.object({ intent: z.literal("final"), upload: z.union([z.literal("newest"), z.coerce.number().int().min(1)]) }),
  z.object({ intent: z.literal("grant-late"), until: z.string().max(40), reason: z.string().max(500) }),
  z.object({ intent: z.literal("revoke-late") }),
]);
export type EntryIntent = z.infer<typeof intents>;

export function parseEntryIntent(form: FormData): EntryIntent | null {
  const parsed = intents.safeParse(Object.fromEntries(form));
  return parsed.success ? parsed.data : null;
}

/** The entry page's intents; each answers the notice to show, refusals are AppErrors. */
export async function pickFinal(entryId: string, userId: string, upload: number | "newest"): Promise<{ notice: string }> {
  const out = await chooseFinalUpload(entryId, userId, upload === "newest" ? null : upload);
  return { notice: out.message };
}

/** The organizer's form gives the end as a wall-clock time in the event's time zone. */
export async function grantFromForm(entryId: string, organizerId: string, timeZone: string, until: string, reason: string): Promise<{ notice: string }> {
  const instant = zonedWallTimeToUtc(until, timeZone);
  if (!instant.ok) {
    const message = instant.reason === "nonexistent" ? "The clocks skip that time in the event's time zone; pick another." : "Give the end as a date and time.";
    throw new AppError(400, "invalid_body", message, { fieldErrors: { until: [message] } });
  }
  const out = await grantLateException(entryId, organizerId, { until: instant.utc, reason });
  return { notice: out.message };
}

export async function revokeFromForm(entryId: string, organizerId: string): Promise<{ notice: string }> {
  const out = await revokeLateException(entryId, organizerId);
  return { notice: out.message };
}
