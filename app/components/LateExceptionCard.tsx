import { Form } from "react-router";
import { formatInZone } from "~/competitions/zone-format";

/**
 * An entry's late exception: what everyone who sees the entry reads (until when, why, who granted it), and the
 * organizer's form to grant or withdraw it. Times in the event's time zone.
 */
export interface LateExceptionView {
  until: string;
  reason: string;
  grantedBy: string | null;
  grantedAt: string | null;
}

// dateStyle cannot be combined with timeZoneName, so formatInZone names the parts one by one
const fmt = (iso: string, timeZone: string) => formatInZone(iso, timeZone);

export function LateExceptionNotice({ exception, timeZone }: { exception: LateExceptionView; timeZone: string }) {
  return (
    <p className="text-sm" data-testid="late-exception">
      <span className="rounded-full bg-violet-soft px-2 py-0.5 text-xs font-semibold text-violet">Late exception</span>{" "}
      Uploads count until <strong>{fmt(exception.until, timeZone)}</strong>, after the deadline, because: <em>{exception.reason}</em>
      {exception.grantedBy && <> — granted by {exception.grantedBy}{exception.grantedAt ? ` on ${fmt(exception.grantedAt, timeZone)}` : ""}</>}.
    </p>
  );
}

export function LateExceptionCard({ exception, organizer, timeZone, cutoffIso }: { exception: LateExceptionView | null; organizer: boolean; timeZone: string; cutoffIso: string | null }) {
  return (
    <section className="card mb-6" aria-labelledby="late-heading">
      <h2 id="late-heading" className="mb-2 text-base font-bold">Late exception</h2>
      {exception ? <LateExceptionNotice exception={exception} timeZone={timeZone} /> : <p className="text-sm text-ink-soft">None. Uploads after the deadline are kept as late and not judged.</p>}
      {organizer && (
        <div className="mt-3 grid gap-3 md:grid-cols-[1fr_auto]">
          <Form method="post" className="grid gap-2 md:grid-cols-[auto_1fr_auto] md:items-end">
            <input type="hidden" name="intent" value="grant-late" />
            <label className="text-sm">
              <span className="label">Uploads count until ({timeZone})</span>
              <input type="datetime-local" name="until" required className="field" />
            </label>
            <label className="text-sm">
              <span className="label">Reason (the crew and the jury see it)</span>
              <input type="text" name="reason" required minLength={5} maxLength={500} className="field" placeholder="e.g. the crew's table lost power at 21:40" />
            </label>
            <button type="submit" className="btn-primary">{exception ? "Change exception" : "Grant exception"}</button>
          </Form>
          {exception && (
            <Form method="post" className="self-end">
              <input type="hidden" name="intent" value="revoke-late" />
              <button type="submit" className="btn-quiet">Withdraw</button>
            </Form>
          )}
          <p className="text-xs text-mute md:col-span-2">
            For this one entry only{cutoffIso ? `, after the deadline of ${fmt(cutoffIso, timeZone)}` : ""}, at most 72 hours past it and not once judging has begun. Every grant and withdrawal is in the audit log.
          </p>
        </div>
      )}
    </section>
  );
}
