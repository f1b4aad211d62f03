import { and, eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { closeDueCompetitions } from "~/competitions/service.server";
import { competitionToForm } from "~/competitions/forms";
import { DEMO_RULESET, rulesetSchema } from "~/rules/ruleset";
import { closeDb, db } from "~/db/client.server";
import { auditLog, checkRuns, competitions, crewMembers, crews, criteria, entries, eventRoles, events, outbox, uploadFiles, uploads } from "~/db/schema";
import { stopQueue } from "~/jobs/queue.server";
import * as calendarRoute from "~/routes/e.$eventSlug.$competitionSlug.calendar[.]ics";
import * as rulesPage from "~/routes/e.$eventSlug.$competitionSlug";
import * as dashboard from "~/routes/organize.$competitionId";
import * as editRoute from "~/routes/organize.$competitionId.edit";
import * as entriesRoute from "~/routes/organize.$competitionId.entries";
import * as fileRoute from "~/routes/organize.$competitionId.files.$fileId";
import * as rulesetJsonRoute from "~/routes/organize.$competitionId.ruleset[.]json";
import * as eventRoute from "~/routes/organize.events.$eventId";
import * as newCompetition from "~/routes/organize.events.$eventId.competitions.new";
import * as newEvent from "~/routes/organize.events.new";
import { putObject } from "~/storage/s3.server";
import { callRoute as callRouteRaw, type Outcome, routeArgs } from "../support/routes";
import { grantEventRole, makeEvent, makeUser, request, sessionCookie, unique, type TestUser } from "../support/users";

afterAll(async () => {
  await stopQueue();
  await closeDb();
});

/** Conform's field names: objects as a.b, lists as a[0].b. */
function flatten(value: unknown, prefix = "", out: Record<string, string> = {}): Record<string, string> {
  if (Array.isArray(value)) value.forEach((v, i) => flatten(v, `${prefix}[${i}]`, out));
  else if (value && typeof value === "object") for (const [k, v] of Object.entries(value)) flatten(v, prefix ? `${prefix}.${k}` : k, out);
  else if (value !== undefined && value !== null && value !== "") out[prefix] = String(value);
  return out;
}

function competitionForm(over: Record<string, string> = {}, drop: string[] = []): Record<string, string> {
  const base = competitionToForm(
    {
      title: "Beam Race",
      slug: "",
      description: "Race the beam.",
      deadlineAt: null,
      graceMinutes: 5,
      votingOpensAt: null,
      votingClosesAt: null,
      showStartsAt: null,
      showMinutes: 60,
      feeAmount: 1500,
      feeCurrency: "eur",
      ruleset: DEMO_RULESET,
      criteria: [],
    },
    "Europe/Berlin",
  );
  const form = flatten({ ...base, criteria: [{ name: "Visuals", weight: "2", scaleMin: "0", scaleMax: "10" }, { name: "Sound", weight: "1", scaleMin: "0", scaleMax: "10" }] });
  for (const k of drop) delete form[k];
  return { ...form, ...over };
}

async function organizerWithEvent(): Promise<{ user: TestUser; cookie: string; event: { id: string; slug: string } }> {
  const user = await makeUser();
  const event = await makeEvent("Org Party");
  await grantEventRole(event.id, user.id, "organizer");
  return { user, cookie: await sessionCookie(user), event };
}

async function createCompetition(cookie: string, eventId: string, over: Record<string, string> = {}): Promise<string> {
  const out = await callRoute(newCompetition.action, request(`/organize/events/${eventId}/competitions/new`, { cookie, form: competitionForm({ slug: unique("c"), ...over }) }), { eventId });
  expect(out.status, JSON.stringify(out.data)).toBe(302);
  return out.location!.split("/").pop()!;
}

/** Like callRoute, and also unwraps a *returned* data(…, { status }) into its status. */
async function callRoute<T>(fn: unknown, req: Request, params: Record<string, string> = {}): Promise<Outcome<T>> {
  const out = await callRouteRaw<T>(fn, req, params);
  const d = out.data as { type?: string; init?: { status?: number }; data?: T } | undefined;
  if (d?.type === "DataWithResponseInit") return { status: d.init?.status ?? 200, data: d.data };
  return out;
}

type Reply = { status?: string; error?: Record<string, string[] | null>; initialValue?: Record<string, unknown> };

describe("events", () => {
  it("keeps the values and puts errors beside the wrong fields", async () => {
    const u = await makeUser();
    const cookie = await sessionCookie(u);
    const out = await callRoute<Reply>(newEvent.action, request("/organize/events/new", { cookie, form: { title: "Vo", timeZone: "Mars/Olympus", venue: "Hall B" } }));
    expect(out.status).toBe(200);
    expect(Object.keys(out.data?.error ?? {}).sort()).toEqual(["timeZone", "title"]);
    expect(out.data?.error?.timeZone?.[0]).toMatch(/IANA/);
    expect(out.data?.initialValue).toMatchObject({ title: "Vo", timeZone: "Mars/Olympus", venue: "Hall B" });
  });

  it("creates the event, makes the creator its organizer, and refuses a taken address", async () => {
    const u = await makeUser();
    const cookie = await sessionCookie(u);
    const slug = unique("party");
    const out = await callRoute(newEvent.action, request("/organize/events/new", { cookie, form: { title: "Harbour Lights", slug, timeZone: "Europe/Berlin", startsAt: "2027-03-26T18:00" } }));
    expect(out.status).toBe(302);
    const id = out.location!.split("/").pop()!;
    const [e] = await db().select().from(events).where(eq(events.id, id));
    expect(e.slug).toBe(slug);
    expect(e.startsAt?.toISOString()).toBe("2027-03-26T17:00:00.000Z"); // CET, UTC+1 (IANA tz database via Intl)
    const roles = await db().select().from(eventRoles).where(eq(eventRoles.eventId, id));
    expect(roles.map((r) => [r.userId, r.role])).toEqual([[u.id, "organizer"]]);
    const again = await callRoute<Reply>(newEvent.action, request("/organize/events/new", { cookie, form: { title: "Other", slug, timeZone: "UTC" } }));
    expect(again.data?.error?.slug?.[0]).toMatch(/taken/);
  });
});

describe("competitions: create and edit", () => {
  it("puts ruleset, criteria and fee errors beside their fields and keeps every value", async () => {
    const { cookie, event } = await organizerWithEvent();
    const form = competitionForm({
      "ruleset.pins[2].width": "0",
      "criteria[1].scaleMax": "-3",
      "ruleset.flipFlopPattern": "(dff",
      "ruleset.forbiddenCellPatterns": "sram\n[unclosed",
      "ruleset.tile.shapes": "single=1x1, three-by-one",
      feeCurrency: "XYZ",
    });
    const out = await callRoute<Reply>(newCompetition.action, request(`/organize/events/${event.id}/competitions/new`, { cookie, form }), { eventId: event.id });
    expect(out.status).toBe(200);
    const errs = out.data?.error ?? {};
    expect(Object.keys(errs).filter((k) => errs[k]?.length).sort()).toEqual(
      ["criteria[1].scaleMax", "feeCurrency", "ruleset.flipFlopPattern", "ruleset.forbiddenCellPatterns", "ruleset.pins[2].width", "ruleset.tile.shapes"].sort(),
    );
    const kept = out.data?.initialValue as { title: string; ruleset: { topModule: string; pins: { name: string }[] } };
    expect(kept.title).toBe("Beam Race");
    expect(kept.ruleset.topModule).toBe("gc_entry");
    expect(kept.ruleset.pins[2].name).toBe("vga_r");
  });

  it("stores deadlines typed on the event's clock in UTC across both 2027 daylight-saving changes in Berlin", async () => {
    // Reference: IANA tz database (Intl). EU summer time 2027: 28 March 01:00Z to 31 October 01:00Z.
    const { cookie, event } = await organizerWithEvent();
    const spring = await createCompetition(cookie, event.id, { deadline: "2027-03-28T03:30" });
    const autumn = await createCompetition(cookie, event.id, { deadline: "2027-10-31T02:30", votingOpens: "2027-10-31T01:00", votingCloses: "2027-10-31T03:00" });
    const [s] = await db().select().from(competitions).where(eq(competitions.id, spring));
    const [a] = await db().select().from(competitions).where(eq(competitions.id, autumn));
    expect(s.deadlineAt?.toISOString()).toBe("2027-03-28T01:30:00.000Z"); // CEST, UTC+2
    expect(a.deadlineAt?.toISOString()).toBe("2027-10-31T00:30:00.000Z"); // first 02:30, still CEST
    expect(a.votingOpensAt?.toISOString()).toBe("2027-10-30T23:00:00.000Z");
    expect(a.votingClosesAt?.toISOString()).toBe("2027-10-31T02:00:00.000Z"); // CET, UTC+1
    const gap = await callRoute<Reply>(newCompetition.action, request(`/organize/events/${event.id}/competitions/new`, { cookie, form: competitionForm({ deadline: "2027-03-28T02:30" }) }), { eventId: event.id });
    expect(gap.data?.error?.deadline?.[0]).toMatch(/does not exist in Europe\/Berlin/);
    // The edit form shows the wall-clock value back.
    const edit = await callRoute<{ defaults: { deadline: string } }>(editRoute.loader, request(`/organize/${spring}/edit`, { cookie }), { competitionId: spring });
    expect(edit.data?.defaults.deadline).toBe("2027-03-28T03:30");
  });

  it("edits in place: criteria keep their ids, the fee is stored in minor units", async () => {
    const { cookie, event } = await organizerWithEvent();
    const id = await createCompetition(cookie, event.id);
    const before = await db().select().from(criteria).where(eq(criteria.competitionId, id));
    expect(before.map((c) => c.name).sort()).toEqual(["Sound", "Visuals"]);
    const visuals = before.find((c) => c.name === "Visuals")!;
    const form = competitionForm({ title: "Beam Race II", feeAmount: "12.50", "criteria[0].id": visuals.id, "criteria[0].name": "Pictures" }, ["criteria[1].name", "criteria[1].weight", "criteria[1].scaleMin", "criteria[1].scaleMax"]);
    const out = await callRoute(editRoute.action, request(`/organize/${id}/edit`, { cookie, form: { ...form, slug: "beam-race-ii" } }), { competitionId: id });
    expect(out.status).toBe(302);
    const after = await db().select().from(criteria).where(eq(criteria.competitionId, id));
    expect(after.map((c) => [c.id, c.name])).toEqual([[visuals.id, "Pictures"]]);
    const [c] = await db().select().from(competitions).where(eq(competitions.id, id));
    expect([c.title, c.feeAmount, c.feeCurrency]).toEqual(["Beam Race II", 1250, "eur"]);
  });
});

describe("ruleset import and export", () => {
  it("exports as a download and imports it back unchanged into another compo", async () => {
    const { cookie, event } = await organizerWithEvent();
    const a = await createCompetition(cookie, event.id, { "ruleset.topModule": "beam_top", "ruleset.flipFlopBudget": "180", "ruleset.tile.shapes": "single=1x1, pair=2x1" });
    const b = await createCompetition(cookie, event.id);
    const res = (await rulesetJsonRoute.loader((await routeArgs(request(`/organize/${a}/ruleset.json`, { cookie }), { competitionId: a })) as never)) as Response;
    expect(res.headers.get("content-disposition")).toMatch(/attachment; filename=".*ruleset-v1\.json"/);
    const text = await res.text();
    const exported = JSON.parse(text);
    expect(exported.topModule).toBe("beam_top");
    const imp = await callRoute(editRoute.action, request(`/organize/${b}/edit`, { cookie, form: { intent: "import", rulesetJson: text } }), { competitionId: b });
    expect(imp.status).toBe(302);
    expect(imp.location).toBe(`/organize/${b}/edit?imported=2`);
    const [rowB] = await db().select().from(competitions).where(eq(competitions.id, b));
    expect(rowB.ruleset).toEqual(exported);
    expect(rowB.rulesetVersion).toBe(2);
    const audits = await db().select().from(auditLog).where(and(eq(auditLog.subjectId, b), eq(auditLog.action, "competition.ruleset-imported")));
    expect(audits).toHaveLength(1);
  });

  it("accepts a minimal ruleset (topModule + pins) and fills in the demo defaults", async () => {
    const { cookie, event } = await organizerWithEvent();
    const id = await createCompetition(cookie, event.id);
    const minimal = { topModule: "mini", pins: [{ name: "clk", direction: "input", width: 1, role: "clock" }] };
    const out = await callRoute(editRoute.action, request(`/organize/${id}/edit`, { cookie, form: { intent: "import", rulesetJson: JSON.stringify(minimal) } }), { competitionId: id });
    expect(out.status).toBe(302);
    const [row] = await db().select().from(competitions).where(eq(competitions.id, id));
    expect(row.ruleset).toEqual(rulesetSchema.parse(minimal));
    expect((row.ruleset as typeof DEMO_RULESET).tile).toEqual(DEMO_RULESET.tile);
  });

  it("answers a wrong import with errors named by path and changes nothing", async () => {
    const { cookie, event } = await organizerWithEvent();
    const id = await createCompetition(cookie, event.id);
    const bad = { ...DEMO_RULESET, pins: [{ name: "clk", direction: "sideways", width: 1, role: "clock" }], flipFlopPattern: "(" };
    const out = await callRoute<{ form: string; result: Reply }>(editRoute.action, request(`/organize/${id}/edit`, { cookie, form: { intent: "import", rulesetJson: JSON.stringify(bad) } }), { competitionId: id });
    expect(out.status).toBe(200);
    expect(out.data?.form).toBe("import");
    expect(out.data?.result.error?.rulesetJson?.some((e) => e.startsWith("pins.0.direction:"))).toBe(true);
    expect(out.data?.result.initialValue?.rulesetJson).toBe(JSON.stringify(bad));
    const broken = await callRoute<{ result: Reply }>(editRoute.action, request(`/organize/${id}/edit`, { cookie, form: { intent: "import", rulesetJson: "{" } }), { competitionId: id });
    expect(broken.data?.result.error?.rulesetJson?.[0]).toMatch(/not valid JSON/);
    const [row] = await db().select().from(competitions).where(eq(competitions.id, id));
    expect(row.rulesetVersion).toBe(1);
    expect(row.ruleset).toEqual(DEMO_RULESET);
  });
});

describe("lifecycle", () => {
  it("refuses to open without a deadline, opens with one, and records each move", async () => {
    const { user, cookie, event } = await organizerWithEvent();
    const id = await createCompetition(cookie, event.id);
    const move = (to: string) => callRoute<{ error: string | null }>(dashboard.action, request(`/organize/${id}`, { cookie, form: { intent: "move", to } }), { competitionId: id });
    const noDeadline = await move("open");
    expect(noDeadline.status).toBe(409);
    expect(noDeadline.data?.error).toMatch(/deadline/);
    const skip = await move("judging");
    expect(skip.status).toBe(409);
    await db().update(competitions).set({ deadlineAt: new Date(Date.now() + 86_400_000) }).where(eq(competitions.id, id));
    expect((await move("open")).status).toBe(200);
    expect((await move("closed")).status).toBe(200);
    expect((await move("judging")).status).toBe(200);
    expect((await move("open")).status).toBe(409);
    const trail = await db().select().from(auditLog).where(eq(auditLog.subjectId, id));
    expect(trail.filter((t) => t.action.startsWith("competition.") && t.action !== "competition.created").map((t) => [t.action, t.actorUserId])).toEqual([
      ["competition.open", user.id],
      ["competition.closed", user.id],
      ["competition.judging", user.id],
    ]);
    const bogus = await move("paused");
    expect(bogus.status).toBe(400);
  });

  it("closes by itself at the deadline: not just before, at it, once", async () => {
    const { cookie, event } = await organizerWithEvent();
    const id = await createCompetition(cookie, event.id);
    const deadline = new Date(Date.now() + 3_600_000);
    await db().update(competitions).set({ state: "open", deadlineAt: deadline }).where(eq(competitions.id, id));
    const stateOf = async () => (await db().select({ s: competitions.state }).from(competitions).where(eq(competitions.id, id)))[0].s;
    expect(await closeDueCompetitions(new Date(deadline.getTime() - 1))).not.toContain(id);
    expect(await stateOf()).toBe("open");
    expect(await closeDueCompetitions(deadline)).toContain(id);
    expect(await stateOf()).toBe("closed");
    expect(await closeDueCompetitions(new Date(deadline.getTime() + 60_000))).not.toContain(id);
    const trail = await db().select().from(auditLog).where(and(eq(auditLog.subjectId, id), eq(auditLog.action, "competition.closed-by-deadline")));
    expect(trail).toHaveLength(1);
    expect(trail[0].actorUserId).toBeNull();
  });

  it("shows the right state between sweeps: a loader closes a compo whose deadline passed", async () => {
    const { cookie, event } = await organizerWithEvent();
    const id = await createCompetition(cookie, event.id);
    await db().update(competitions).set({ state: "open", deadlineAt: new Date(Date.now() - 1000) }).where(eq(competitions.id, id));
    const out = await callRoute<{ competition: { state: string } }>(dashboard.loader, request(`/organize/${id}`, { cookie }), { competitionId: id });
    expect(out.data?.competition.state).toBe("closed");
    const [c] = await db().select().from(competitions).where(eq(competitions.id, id));
    const pub = await callRoute<{ competition: { state: string } }>(rulesPage.loader, request(`/e/${event.slug}/${c.slug}`), { eventSlug: event.slug, competitionSlug: c.slug });
    expect(pub.data?.competition.state).toBe("closed");
  });
});

describe("frozen rules after the deadline", () => {
  it("refuses to move the deadline, fee or ruleset of a closed compo, but saves its title", async () => {
    const { cookie, event } = await organizerWithEvent();
    const id = await createCompetition(cookie, event.id, { deadline: "2027-03-28T20:00" });
    await db().update(competitions).set({ state: "closed" }).where(eq(competitions.id, id));
    const edit = await callRoute<{ defaults: Record<string, unknown>; frozen: boolean }>(editRoute.loader, request(`/organize/${id}/edit`, { cookie }), { competitionId: id });
    expect(edit.data?.frozen).toBe(true);
    const saved = flatten(edit.data?.defaults);
    const moved = await callRoute<{ result: Reply }>(editRoute.action, request(`/organize/${id}/edit`, { cookie, form: { ...saved, deadline: "2027-04-04T20:00", "ruleset.topModule": "other_top" } }), { competitionId: id });
    expect(moved.status).toBe(200);
    expect(Object.keys(moved.data?.result.error ?? {}).filter((k) => moved.data?.result.error?.[k]?.length).sort()).toEqual(["", "deadline", "ruleset.topModule"].sort());
    const renamed = await callRoute(editRoute.action, request(`/organize/${id}/edit`, { cookie, form: { ...saved, title: "Renamed after the deadline" } }), { competitionId: id });
    expect(renamed.status).toBe(302);
    const [c] = await db().select().from(competitions).where(eq(competitions.id, id));
    expect([c.title, c.deadlineAt?.toISOString(), c.rulesetVersion]).toEqual(["Renamed after the deadline", "2027-03-28T18:00:00.000Z", 1]);
    const imp = await callRoute<{ result: Reply }>(editRoute.action, request(`/organize/${id}/edit`, { cookie, form: { intent: "import", rulesetJson: JSON.stringify(DEMO_RULESET) } }), { competitionId: id });
    expect(imp.data?.result.error?.rulesetJson?.[0]).toMatch(/frozen/);
  });
});

describe("access", () => {
  it("answers another event's ids with 404, lets an admin in, sends anonymous visitors to sign in", async () => {
    const a = await organizerWithEvent();
    const b = await organizerWithEvent();
    const bComp = await createCompetition(b.cookie, b.event.id);
    const judge = await makeUser();
    await grantEventRole(b.event.id, judge.id, "judge");
    const admin = await makeUser({ admin: true });
    const [cj, ca] = await Promise.all([sessionCookie(judge), sessionCookie(admin)]);
    const p = { competitionId: bComp };
    for (const cookie of [a.cookie, cj]) {
      expect((await callRoute(dashboard.loader, request(`/organize/${bComp}`, { cookie }), p)).status).toBe(404);
      expect((await callRoute(dashboard.action, request(`/organize/${bComp}`, { cookie, form: { intent: "move", to: "open" } }), p)).status).toBe(404);
      expect((await callRoute(editRoute.loader, request(`/organize/${bComp}/edit`, { cookie }), p)).status).toBe(404);
      expect((await callRoute(editRoute.action, request(`/organize/${bComp}/edit`, { cookie, form: { intent: "import", rulesetJson: "{}" } }), p)).status).toBe(404);
      expect((await callRoute(entriesRoute.loader, request(`/organize/${bComp}/entries`, { cookie }), p)).status).toBe(404);
      expect((await callRoute(rulesetJsonRoute.loader, request(`/organize/${bComp}/ruleset.json`, { cookie }), p)).status).toBe(404);
      expect((await callRoute(eventRoute.loader, request(`/organize/events/${b.event.id}`, { cookie }), { eventId: b.event.id })).status).toBe(404);
      expect((await callRoute(newCompetition.action, request(`/organize/events/${b.event.id}/competitions/new`, { cookie, form: competitionForm() }), { eventId: b.event.id })).status).toBe(404);
    }
    expect((await callRoute(dashboard.loader, request(`/organize/not-a-uuid`, { cookie: a.cookie }), { competitionId: "not-a-uuid" })).status).toBe(404);
    expect((await callRoute(dashboard.loader, request(`/organize/${bComp}`, { cookie: ca }), p)).status).toBe(200);
    expect((await callRoute(dashboard.loader, request(`/organize/${bComp}`, { cookie: b.cookie }), p)).status).toBe(200);
    const anon = await callRoute(dashboard.loader, request(`/organize/${bComp}`), p);
    expect(anon.status).toBe(302);
    expect(anon.location).toMatch(/^\/sign-in\?next=/);
  });

  it("keeps drafts off the public page and the calendar, except for the event's organizers", async () => {
    const { cookie, event } = await organizerWithEvent();
    const id = await createCompetition(cookie, event.id, { deadline: "2027-03-28T20:00" });
    const [c] = await db().select().from(competitions).where(eq(competitions.id, id));
    const params = { eventSlug: event.slug, competitionSlug: c.slug };
    expect((await callRoute(rulesPage.loader, request(`/e/${event.slug}/${c.slug}`), params)).status).toBe(404);
    expect((await callRoute(calendarRoute.loader, request(`/e/${event.slug}/${c.slug}/calendar.ics`), params)).status).toBe(404);
    const stranger = await sessionCookie(await makeUser());
    expect((await callRoute(rulesPage.loader, request(`/e/${event.slug}/${c.slug}`, { cookie: stranger }), params)).status).toBe(404);
    const preview = await callRoute<{ preview: boolean }>(rulesPage.loader, request(`/e/${event.slug}/${c.slug}`, { cookie }), params);
    expect(preview.data?.preview).toBe(true);
    await db().update(competitions).set({ state: "open" }).where(eq(competitions.id, id));
    const pub = await callRoute<{ preview: boolean; ruleset: { topModule: string }; competition: { fee: string; deadlineAt: string } }>(rulesPage.loader, request(`/e/${event.slug}/${c.slug}`), params);
    expect(pub.status).toBe(200);
    expect(pub.data?.preview).toBe(false);
    expect(pub.data?.ruleset.topModule).toBe("gc_entry");
    expect(pub.data?.competition.fee).toBe("€15.00");
    expect(pub.data?.competition.deadlineAt).toBe("2027-03-28T18:00:00.000Z");
  });
});

describe("the calendar file", () => {
  it("is RFC 5545: CRLF lines of at most 75 octets, UTC times, UID and DTSTAMP on each event", async () => {
    const { cookie, event } = await organizerWithEvent();
    const id = await createCompetition(cookie, event.id, {
      title: "A compo with a rather long title, to make the summary line fold",
      deadline: "2027-10-31T02:30",
      votingOpens: "2027-11-01T19:00",
      votingCloses: "2027-11-01T22:00",
    });
    await db().update(competitions).set({ state: "open" }).where(eq(competitions.id, id));
    const [c] = await db().select().from(competitions).where(eq(competitions.id, id));
    const res = (await calendarRoute.loader((await routeArgs(request(`/e/${event.slug}/${c.slug}/calendar.ics`), { eventSlug: event.slug, competitionSlug: c.slug })) as never)) as Response;
    expect(res.headers.get("content-type")).toBe("text/calendar; charset=utf-8");
    const ics = await res.text();
    // RFC 5545 3.1: lines end in CRLF and are folded at 75 octets.
    expect(ics.replace(/\r\n/g, "")).not.toMatch(/[\r\n]/);
    for (const line of ics.split("\r\n")) expect(Buffer.byteLength(line, "utf8")).toBeLessThanOrEqual(75);
    const unfolded = ics.replace(/\r\n /g, "");
    // 3.3.5 UTC form; deadline 02:30 CEST on 31 October 2027 (first occurrence) is 00:30Z (IANA tz via Intl).
    expect(unfolded).toContain("DTSTART:20271031T003000Z");
    expect(unfolded).toContain("DTSTART:20271101T180000Z");
    expect(unfolded).toContain("DTEND:20271101T210000Z");
    // 3.6.1: UID and DTSTAMP are required in each VEVENT.
    const vevents = unfolded.split("BEGIN:VEVENT").slice(1);
    expect(vevents).toHaveLength(2);
    for (const v of vevents) {
      expect(v).toMatch(/\r\nUID:[^\r\n]+@gatecrash\r\n/);
      expect(v).toMatch(/\r\nDTSTAMP:\d{8}T\d{6}Z\r\n/);
    }
    expect(unfolded).toContain("SUMMARY:Entry deadline: A compo with a rather long title\\, to make the summary line fold");
    // the deadline says what to design for: the board clock, clocks per pixel and the monitor window (3.3.11 escapes)
    expect(unfolded).toContain("Design for: board clock 25.175 MHz ± 0.5 %\\, 1 clock per pixel\\, 640×480 @ 60 Hz (VESA DMT)\\; monitor window 31–32 kHz\\, 59–61 Hz.");
  });
});

describe("entries table, downloads and disqualification", () => {
  async function competitionWithEntry() {
    const org = await organizerWithEvent();
    const id = await createCompetition(org.cookie, org.event.id);
    const [m1, m2] = await Promise.all([makeUser({ name: "Ada Member" }), makeUser({ name: "Bo Member" })]);
    const [crew] = await db().insert(crews).values({ handle: unique("crew"), name: "Scanline Cats" }).returning();
    await db().insert(crewMembers).values([
      { crewId: crew.id, userId: m1.id, role: "captain" },
      { crewId: crew.id, userId: m2.id, role: "member" },
    ]);
    const [entry] = await db().insert(entries).values({ competitionId: id, crewId: crew.id, title: "Copper Dreams", feeState: "paid" }).returning();
    await db().insert(uploads).values({ entryId: entry.id, number: 1, state: "complete", completedAt: new Date("2027-03-20T10:00:00Z") });
    const [u2] = await db().insert(uploads).values({ entryId: entry.id, number: 2, state: "complete", completedAt: new Date("2027-03-21T10:00:00Z") }).returning();
    await db().insert(uploads).values({ entryId: entry.id, number: 3, state: "pending" });
    await db().insert(checkRuns).values({ uploadId: u2.id, state: "done", verdict: "warn" });
    const key = `test/${unique("file")}/layout.gds`;
    await putObject(key, Buffer.from("GDSII bytes"), "application/octet-stream");
    const [file] = await db().insert(uploadFiles).values({ uploadId: u2.id, kind: "layout", s3Key: key, filename: "layout.gds", claimedBytes: 11, sizeBytes: 11, state: "confirmed" }).returning();
    return { ...org, competitionId: id, entry, crew, members: [m1, m2], file };
  }

  it("lists each entry with its crew, fee, newest upload, check verdict and files", async () => {
    const f = await competitionWithEntry();
    const out = await callRoute<{ rows: { title: string; crewHandle: string; feeState: string; uploadNumber: number; verdict: string; state: string; files: { id: string }[] }[] }>(
      entriesRoute.loader,
      request(`/organize/${f.competitionId}/entries`, { cookie: f.cookie }),
      { competitionId: f.competitionId },
    );
    expect(out.data?.rows).toHaveLength(1);
    expect(out.data?.rows[0]).toMatchObject({ title: "Copper Dreams", crewHandle: f.crew.handle, feeState: "paid", uploadNumber: 2, verdict: "warn", state: "active" });
    expect(out.data?.rows[0].files.map((x) => x.id)).toEqual([f.file.id]);
  });

  it("downloads a file through a presigned link, and only files of this compo", async () => {
    const f = await competitionWithEntry();
    const other = await competitionWithEntry();
    const ok = await callRoute(fileRoute.loader, request(`/organize/${f.competitionId}/files/${f.file.id}`, { cookie: f.cookie }), { competitionId: f.competitionId, fileId: f.file.id });
    expect(ok.status).toBe(302);
    expect(ok.location).toMatch(/X-Amz-Signature=/);
    const body = await fetch(ok.location!);
    expect(await body.text()).toBe("GDSII bytes");
    const cross = await callRoute(fileRoute.loader, request(`/organize/${f.competitionId}/files/${other.file.id}`, { cookie: f.cookie }), { competitionId: f.competitionId, fileId: other.file.id });
    expect(cross.status).toBe(404);
  });

  it("disqualifies with a reason: mails every crew member, writes the audit row, refuses a repeat", async () => {
    const f = await competitionWithEntry();
    const p = { competitionId: f.competitionId };
    const short = await callRoute<{ result: Reply }>(entriesRoute.action, request(`/organize/${f.competitionId}/entries`, { cookie: f.cookie, form: { intent: "disqualify", entryId: f.entry.id, reason: "no" } }), p);
    expect(short.data?.result.error?.reason?.[0]).toMatch(/At least 10/);
    expect(short.data?.result.initialValue?.reason).toBe("no");
    const reason = "The layout uses three tiles; the ruleset allows two.";
    const out = await callRoute<{ mailed: number }>(entriesRoute.action, request(`/organize/${f.competitionId}/entries`, { cookie: f.cookie, form: { intent: "disqualify", entryId: f.entry.id, reason } }), p);
    expect(out.status).toBe(200);
    expect(out.data?.mailed).toBe(2);
    const [e] = await db().select().from(entries).where(eq(entries.id, f.entry.id));
    expect([e.state, e.disqualifiedReason]).toEqual(["disqualified", reason]);
    for (const m of f.members) {
      const mails = await db().select().from(outbox).where(eq(outbox.toAddress, m.email));
      expect(mails).toHaveLength(1);
      expect(mails[0].subject).toMatch(/“Copper Dreams” was disqualified/);
      expect(mails[0].textBody).toContain(reason);
    }
    const trail = await db().select().from(auditLog).where(and(eq(auditLog.subjectId, f.entry.id), eq(auditLog.action, "entry.disqualified")));
    expect(trail).toHaveLength(1);
    expect(trail[0].actorUserId).toBe(f.user.id);
    expect(trail[0].details).toMatchObject({ reason });
    const again = await callRoute(entriesRoute.action, request(`/organize/${f.competitionId}/entries`, { cookie: f.cookie, form: { intent: "disqualify", entryId: f.entry.id, reason } }), p);
    expect(again.status).toBe(409);
    // An entry of another compo is not reachable through this one.
    const other = await competitionWithEntry();
    const cross = await callRoute(entriesRoute.action, request(`/organize/${f.competitionId}/entries`, { cookie: f.cookie, form: { intent: "disqualify", entryId: other.entry.id, reason } }), p);
    expect(cross.status).toBe(404);
  });
});
