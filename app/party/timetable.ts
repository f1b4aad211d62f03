import { buildCalendar, type CalendarItem } from "~/competitions/ical";

/**
 * The party's timetable: per compo its entry deadline, its audience vote window and its show on the big screen,
 * in time order. Pure: the public party page, the party .ics and the per-compo .ics all come from here.
 */
export interface TimetableCompo {
  id: string;
  slug: string;
  title: string;
  deadlineAt: Date | null;
  graceMinutes: number;
  votingOpensAt: Date | null;
  votingClosesAt: Date | null;
  showStartsAt: Date | null;
  showMinutes: number;
  /** The board clock and monitor window in one line (signalSummary), for the deadline's description. */
  signal?: string;
}

export type SlotKind = "deadline" | "vote" | "show";

export interface TimetableSlot {
  kind: SlotKind;
  competitionId: string;
  competitionSlug: string;
  competitionTitle: string;
  start: Date;
  /** null: an instant (the deadline) */
  end: Date | null;
}

const MINUTE = 60_000;

export function compoSlots(c: TimetableCompo): TimetableSlot[] {
  const base = { competitionId: c.id, competitionSlug: c.slug, competitionTitle: c.title };
  const out: TimetableSlot[] = [];
  if (c.deadlineAt) out.push({ ...base, kind: "deadline", start: c.deadlineAt, end: null });
  if (c.votingOpensAt && c.votingClosesAt) out.push({ ...base, kind: "vote", start: c.votingOpensAt, end: c.votingClosesAt });
  if (c.showStartsAt) out.push({ ...base, kind: "show", start: c.showStartsAt, end: new Date(c.showStartsAt.getTime() + c.showMinutes * MINUTE) });
  return out;
}

const ORDER: Record<SlotKind, number> = { deadline: 0, show: 1, vote: 2 };

export function timetable(compos: TimetableCompo[]): TimetableSlot[] {
  return compos
    .flatMap(compoSlots)
    .sort((a, b) => a.start.getTime() - b.start.getTime() || ORDER[a.kind] - ORDER[b.kind] || a.competitionTitle.localeCompare(b.competitionTitle));
}

export const SLOT_NAMES: Record<SlotKind, string> = { deadline: "Entry deadline", vote: "Audience vote", show: "On the big screen" };

export interface CalendarParty {
  title: string;
  slug: string;
  venue: string;
  timeZone: string;
}

function slotDescription(s: TimetableSlot, c: TimetableCompo | undefined, party: CalendarParty): string {
  const tz = `Times are in UTC; the party runs on ${party.timeZone}.`;
  if (s.kind === "deadline")
    return `Uploads must be complete by this time${c?.graceMinutes ? ` (uploads finishing within ${c.graceMinutes} minutes after it still count)` : ""}.${c?.signal ? ` Design for: ${c.signal}.` : ""} Party: ${party.title}. ${tz}`;
  if (s.kind === "vote") return `One ballot per person and compo during this window. Party: ${party.title}. ${tz}`;
  return `The entries of ${s.competitionTitle} on the party's big screen. Party: ${party.title}. ${tz}`;
}

/** One iCalendar (RFC 5545) of the given slots; UIDs are stable per compo and kind, so a re-import updates. */
export function slotsCalendar(opts: { name: string; party: CalendarParty; compos: TimetableCompo[]; slots: TimetableSlot[]; pageUrl: (slot: TimetableSlot) => string; now: Date }): string {
  const byId = new Map(opts.compos.map((c) => [c.id, c]));
  const items: CalendarItem[] = opts.slots.map((s) => ({
    uid: `${s.kind === "vote" ? "voting" : s.kind}-${s.competitionId}@gatecrash`,
    summary: `${SLOT_NAMES[s.kind]}: ${s.competitionTitle}`,
    description: slotDescription(s, byId.get(s.competitionId), opts.party),
    location: opts.party.venue || undefined,
    url: opts.pageUrl(s),
    start: s.start,
    end: s.end ?? undefined,
  }));
  return buildCalendar({ name: opts.name, items, now: opts.now });
}

export function partyCalendar(party: CalendarParty, compos: TimetableCompo[], origin: string, now: Date): string {
  return slotsCalendar({
    name: party.title,
    party,
    compos,
    slots: timetable(compos),
    pageUrl: (s) => new URL(`/e/${party.slug}/${s.competitionSlug}`, origin).toString(),
    now,
  });
}
