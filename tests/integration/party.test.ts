import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parse as parseCsv } from "csv-parse/sync";
import ICAL from "ical.js";
import { and, eq } from "drizzle-orm";
import yauzl from "yauzl";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "~/db/client.server";
import { voteCodeScopes, voteCodes } from "~/db/schema";
import { stopQueue } from "~/jobs/queue.server";
import * as archiveRoute from "~/routes/organize.party.archive";
import * as partyDesk from "~/routes/organize.events.$eventId.party";
import * as partyCodesRoute from "~/routes/organize.party.codes";
import * as partyPage from "~/routes/party";
import * as partyIcs from "~/routes/party.calendar[.]ics";
import * as partyResultsRoute from "~/routes/party.results";
import * as resultsPage from "~/routes/results";
import * as shuttlePage from "~/routes/organize.party.shuttle";
import * as shuttleZip from "~/routes/organize.party.shuttle-zip";
import { publishResults } from "~/results/results.server";
import { stageScreens } from "~/stage/stage.server";
import { competitionById } from "~/showcase/showcase.server";
import { putObject } from "~/storage/s3.server";
import { castBallot, VoteError } from "~/voting/voting.server";
import { callRoute, routeContext } from "../support/routes";
import { makeUser, request, sessionCookie } from "../support/users";
import { twoCompoParty, withStoredFiles } from "./party.fixtures";
import { addScores, makeCompo, setCompetition, type CompoFixture } from "./showcase.fixtures";

afterAll(async () => {
  await stopQueue();
  await closeDb();
});

const HOUR = 3600_000;


async function desk(f: CompoFixture, form: Record<string, string | string[]>) {
  const body = new URLSearchParams();
  for (const [k, v] of Object.entries(form)) for (const x of [v].flat()) body.append(k, x);
  const req = new Request(new URL(`/organize/events/${f.event.id}/party`, process.env.APP_URL), { method: "POST", headers: { cookie: f.organizerCookie, "content-type": "application/x-www-form-urlencoded" }, body });
  return callRoute<any>(partyDesk.action, req, { eventId: f.event.id });
}

async function bodyOf(fn: unknown, path: string, params: Record<string, string>, cookie?: string): Promise<Response> {
  const req = request(path, { cookie });
  return (await (fn as (a: unknown) => Promise<Response>)({ request: req, params, context: await routeContext(req) })) as Response;
}

describe("party-wide vote codes", () => {
  it("one slip votes once in each of its compos; the sheet and CSV name the compos; per-compo codes stay per compo", async () => {
    const { a, b } = await twoCompoParty();
    const made = await desk(a, { intent: "codes", count: "3", compos: [a.competitionId, b.competitionId] });
    expect(made.status).toBe(200);
    expect(made.data.done).toMatch(/3 party-wide codes/);
    const csv = await bodyOf(partyCodesRoute.loader, `/organize/events/${a.event.id}/party/codes.csv`, { eventId: a.event.id }, a.organizerCookie);
    const rows = parseCsv(await csv.text(), { columns: true }) as Record<string, string>[];
    expect(rows).toHaveLength(3);
    for (const r of rows) {
      expect(r.party_wide).toBe("yes");
      expect(r.votes_in.split(" ").sort()).toEqual([a.slug, b.slug].sort());
      expect(r.used_in).toBe("");
    }
    const code = rows[0].code;

    const ballotA = { points: { [a.entries[0].id]: 5 } };
    const ballotB = { points: { [b.entries[0].id]: 4 } };
    const inA = await castBallot({ competitionId: a.competitionId, voter: { kind: "new-code", code }, content: ballotA });
    expect(inA.holderToken).toBeTruthy();
    const inB = await castBallot({ competitionId: b.competitionId, voter: { kind: "new-code", code }, content: ballotB });
    expect(inB.holderToken).toBeTruthy();
    expect(inB.holderToken).not.toBe(inA.holderToken);
    // Once per compo: the same code again in A is refused.
    await expect(castBallot({ competitionId: a.competitionId, voter: { kind: "new-code", code }, content: ballotA })).rejects.toMatchObject({ code: "code_used" });

    // A per-compo code of A does not vote in B.
    const own = await callRoute<any>(
      (await import("~/routes/organize.audience")).action,
      request(`/organize/${a.competitionId}/audience`, { cookie: a.organizerCookie, form: { count: "1" } }),
      { competitionId: a.competitionId },
    );
    expect(own.data.made).toBe(1);
    const [ownCode] = await db()
      .select({ code: voteCodes.code })
      .from(voteCodes)
      .innerJoin(voteCodeScopes, eq(voteCodeScopes.voteCodeId, voteCodes.id))
      .where(and(eq(voteCodes.partyWide, false), eq(voteCodeScopes.competitionId, a.competitionId)));
    const err = await castBallot({ competitionId: b.competitionId, voter: { kind: "new-code", code: ownCode.code }, content: ballotB }).catch((e) => e);
    expect(err).toBeInstanceOf(VoteError);

    // The CSV now says where the slip was used; the print sheet leaves it out and names both compos on the others.
    const after = parseCsv(await (await bodyOf(partyCodesRoute.loader, `/organize/events/${a.event.id}/party/codes.csv`, { eventId: a.event.id }, a.organizerCookie)).text(), { columns: true }) as Record<string, string>[];
    expect(after.find((r) => r.code === code)!.used_in.split(" ").map((x) => x.split("@")[0]).sort()).toEqual([a.slug, b.slug].sort());
    const sheet = await (await bodyOf(partyCodesRoute.loader, `/organize/events/${a.event.id}/party/codes`, { eventId: a.event.id }, a.organizerCookie)).text();
    expect(sheet.match(/class="slip"/g)).toHaveLength(2);
    expect(sheet).not.toContain(code);
    expect(sheet).toContain("Votes in: Alpha Beam · Bravo Tone");
  });

  it("refuses a compo of another party, and strangers", async () => {
    const { a } = await twoCompoParty();
    const other = await makeCompo();
    const r = await desk(a, { intent: "codes", count: "2", compos: [a.competitionId, other.competitionId] });
    expect(r.data.result.error[""]).toEqual(["Every compo of a code sheet must belong to this party."]);
    const stranger = await sessionCookie(await makeUser());
    const s = await callRoute(partyCodesRoute.loader, request(`/organize/events/${a.event.id}/party/codes.csv`, { cookie: stranger }), { eventId: a.event.id });
    expect(s.status).toBe(404);
  });
});

describe("awards, party results and the timetable", () => {
  it("an award shows with its compo's published results, in stage mode and on the party sheets", async () => {
    const { a, b } = await twoCompoParty();
    await addScores(a, [[[9, 9], [5, 5], [1, 1]]]);
    const add = await desk(a, { intent: "award-add", title: "Best sound", citation: "For a bass line that shook the hall", winnerEntryId: a.entries[2].id });
    expect(add.data.done).toBe("Award added.");
    const bad = await desk(a, { intent: "award-add", title: "Smallest design", winnerEntryId: (await makeCompo()).entries[0].id });
    expect(bad.data.result.error.winnerEntryId).toBeTruthy();

    const params = { eventSlug: a.event.slug, competitionSlug: a.slug };
    // Not public before the results are out.
    const before = await callRoute<any>(resultsPage.loader, request(`/e/${a.event.slug}/${a.slug}/results`), params);
    expect(before.data.awards).toEqual([]);
    await publishResults(a.competitionId, a.organizer.id, "");
    const after = await callRoute<any>(resultsPage.loader, request(`/e/${a.event.slug}/${a.slug}/results`), params);
    expect(after.data.awards).toEqual([expect.objectContaining({ title: "Best sound", entry: a.entries[2].title, crew: a.entries[2].crew })]);

    const screens = await stageScreens((await competitionById(a.competitionId))!);
    const last = screens.slice(-2);
    expect(last[0]).toMatchObject({ kind: "award", award: "Best sound", title: a.entries[2].title });
    expect(last[1].kind).toBe("end");

    const txt = await (await bodyOf(partyResultsRoute.loader, `/e/${a.event.slug}/results.txt`, { eventSlug: a.event.slug })).text();
    expect(txt).toContain("Alpha Beam (results version 1");
    expect(txt).toContain("Bravo Tone: results not out yet.");
    expect(txt).toMatch(/Best sound\s+Entry C\s+Crew Entry C\s+Alpha Beam/);
    const csv = parseCsv(await (await bodyOf(partyResultsRoute.loader, `/e/${a.event.slug}/results.csv`, { eventSlug: a.event.slug })).text(), { columns: true }) as Record<string, string>[];
    const places = csv.filter((r) => r.award === "");
    expect(places.map((r) => [r.compo_slug, r.place, r.entry])).toEqual([
      [a.slug, "1", "Entry A"],
      [a.slug, "2", "Entry B"],
      [a.slug, "3", "Entry C"],
    ]);
    expect(Number(places[0].points)).toBeGreaterThan(Number(places[1].points));
    expect(csv.filter((r) => r.award !== "").map((r) => [r.award, r.entry, r.crew])).toEqual([["Best sound", "Entry C", "Crew Entry C"]]);
    void b;
  });

  it("the public party page lists deadlines, vote windows and shows in time order, and one .ics holds them all (RFC 5545, read back with ical.js)", async () => {
    const { a, b } = await twoCompoParty();
    const t0 = new Date("2031-06-12T16:00:00Z");
    await setCompetition(a.competitionId, { deadlineAt: t0, votingOpensAt: new Date(t0.getTime() + 5 * HOUR), votingClosesAt: new Date(t0.getTime() + 30 * HOUR), showStartsAt: new Date(t0.getTime() + 4 * HOUR), showMinutes: 45 });
    await setCompetition(b.competitionId, { deadlineAt: new Date(t0.getTime() + HOUR), votingOpensAt: null, votingClosesAt: null, showStartsAt: new Date(t0.getTime() + 6 * HOUR), showMinutes: 30 });
    const page = await callRoute<any>(partyPage.loader, request(`/e/${a.event.slug}`), { eventSlug: a.event.slug });
    expect(page.data.slots.map((s: any) => [s.kind, s.compo])).toEqual([
      ["deadline", "Alpha Beam"],
      ["deadline", "Bravo Tone"],
      ["show", "Alpha Beam"],
      ["vote", "Alpha Beam"],
      ["show", "Bravo Tone"],
    ]);
    // Europe/Berlin is UTC+2 in June (CEST, EU summer time from the last Sunday of March).
    expect(page.data.slots[0].start).toContain("18:00");

    const ics = await (await bodyOf(partyIcs.loader, `/e/${a.event.slug}/calendar.ics`, { eventSlug: a.event.slug })).text();
    // RFC 5545 3.1: CRLF line ends, no physical line longer than 75 octets.
    expect(ics.replace(/\r\n/g, "")).not.toMatch(/[\r\n]/);
    for (const l of ics.split("\r\n")) expect(Buffer.byteLength(l)).toBeLessThanOrEqual(75);
    const cal = new ICAL.Component(ICAL.parse(ics));
    expect(cal.getFirstPropertyValue("version")).toBe("2.0");
    const events = cal.getAllSubcomponents("vevent").map((v) => new ICAL.Event(v));
    expect(events).toHaveLength(5);
    const show = events.find((e) => e.summary === "On the big screen: Alpha Beam")!;
    expect(show.startDate.toJSDate().toISOString()).toBe("2031-06-12T20:00:00.000Z");
    expect(show.endDate.toJSDate().toISOString()).toBe("2031-06-12T20:45:00.000Z");
    expect(new Set(events.map((e) => e.uid)).size).toBe(5);
    const vote = events.find((e) => e.summary === "Audience vote: Alpha Beam")!;
    expect(vote.endDate.toJSDate().getTime() - vote.startDate.toJSDate().getTime()).toBe(25 * HOUR);
  });
});

async function download(fn: unknown, path: string, params: Record<string, string>, cookie: string): Promise<{ res: Response; file: string; dir: string }> {
  const res = await bodyOf(fn, path, params, cookie);
  const dir = mkdtempSync(join(tmpdir(), "gc-party-"));
  const file = join(dir, "out.zip");
  writeFileSync(file, Buffer.from(await res.arrayBuffer()));
  return { res, file, dir };
}

function yauzlEntries(file: string): Promise<Map<string, Buffer>> {
  return new Promise((resolve, reject) => {
    yauzl.open(file, { lazyEntries: true }, (err, zip) => {
      if (err || !zip) return reject(err);
      const out = new Map<string, Buffer>();
      zip.on("entry", (entry: yauzl.Entry) => {
        zip.openReadStream(entry, (e2, s) => {
          if (e2 || !s) return reject(e2);
          const chunks: Buffer[] = [];
          s.on("data", (c: Buffer) => chunks.push(c));
          s.on("end", () => {
            out.set(entry.fileName, Buffer.concat(chunks));
            zip.readEntry();
          });
        });
      });
      zip.on("end", () => resolve(out));
      zip.readEntry();
    });
  });
}

describe("after the party", () => {
  it("the archive holds every shown entry with an info file, and its SHA256SUMS checks out (unzip + sha256sum -c, and yauzl + node:crypto)", async () => {
    const { a, b } = await twoCompoParty();
    await withStoredFiles(a, ["pass", "warn", "fail"]);
    await withStoredFiles(b, ["pass", "pass", "pass"]);
    await addScores(a, [[[9, 9], [5, 5], [1, 1]]]);
    await publishResults(a.competitionId, a.organizer.id, "");
    await desk(a, { intent: "award-add", title: "Jury's choice", winnerEntryId: a.entries[1].id });

    const { res, file, dir } = await download(archiveRoute.loader, `/organize/events/${a.event.id}/archive.zip`, { eventId: a.event.id }, a.organizerCookie);
    try {
      expect(res.headers.get("content-type")).toBe("application/zip");
      expect(Number(res.headers.get("content-length"))).toBe(readFileSync(file).length);
      // Independent tools: Info-ZIP unzip, then GNU coreutils sha256sum reading the manifest.
      execFileSync("unzip", ["-q", file, "-d", join(dir, "x")]);
      const root = join(dir, "x", `${a.event.slug}-archive`);
      const check = execFileSync("sha256sum", ["-c", "--strict", "SHA256SUMS"], { cwd: root, encoding: "utf8" });
      const okLines = check.trim().split("\n");
      expect(okLines.every((l) => l.endsWith(": OK"))).toBe(true);
      // 6 entries × (info + source + layout + capture + 3 reference files) + README
      expect(okLines).toHaveLength(6 * 7 + 1);

      // And again with yauzl and node:crypto: every file but the manifest is listed, with its own hash.
      const files = await yauzlEntries(file);
      const manifest = files.get(`${a.event.slug}-archive/SHA256SUMS`)!.toString("utf8");
      const listed = new Map(manifest.trim().split("\n").map((l) => [l.slice(66), l.slice(0, 64)]));
      const contents = [...files.keys()].filter((k) => !k.endsWith("/SHA256SUMS"));
      expect(contents.length).toBe(listed.size);
      for (const k of contents) expect(createHash("sha256").update(files.get(k)!).digest("hex")).toBe(listed.get(k.slice(`${a.event.slug}-archive/`.length)));

      const info = [...files.entries()].filter(([k]) => k.endsWith("info.txt") && k.includes(`/${a.slug}/`)).map(([, v]) => v.toString("utf8"));
      const second = info.find((t) => t.includes("Title: Entry B"))!;
      expect(second).toContain("Crew: Crew Entry B");
      expect(second).toMatch(/Place: 2 with 0\.\d{3} points \(results version 1\)/);
      expect(second).toContain("Awards: Jury's choice");
      expect(second).toMatch(/[0-9a-f]{64} {2}\d+ {2}layout\.gds/);
      expect(info.find((t) => t.includes("Title: Entry A"))).toContain("Place: 1");
      const bInfo = [...files.entries()].find(([k]) => k.endsWith("info.txt") && k.includes(`/${b.slug}/`))![1].toString();
      expect(bInfo).toContain("Place: not placed: no results published");
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("the archive download aborts when a stored object no longer matches its recorded SHA-256", async () => {
    const a = await makeCompo();
    const stored = await withStoredFiles(a, ["pass", "pass", "pass"]);
    const before = await bodyOf(archiveRoute.loader, `/organize/events/${a.event.id}/archive.zip`, { eventId: a.event.id }, a.organizerCookie);
    expect((await before.arrayBuffer()).byteLength).toBeGreaterThan(0); // whole before the tampering
    // Same size, other bytes: only the hash on the way out can tell.
    await putObject(stored[1].wavKey, Buffer.alloc(`wav of ${a.entries[1].title}`.length, "x"), "audio/wav");
    const res = await bodyOf(archiveRoute.loader, `/organize/events/${a.event.id}/archive.zip`, { eventId: a.event.id }, a.organizerCookie);
    expect(res.status).toBe(200); // the sizes agree, so the download starts …
    await expect(res.arrayBuffer()).rejects.toThrow(/stored bytes hash to [0-9a-f]{64}, the upload recorded/); // … and breaks off at that file
  });

  it("an archive with a stored file missing from storage is refused up front with a clear error, naming the file", async () => {
    const f = await makeCompo({ entryCount: 1 });
    const out = await callRoute<{ message: string }>(archiveRoute.loader, request(`/organize/events/${f.event.id}/archive.zip`, { cookie: f.organizerCookie }), { eventId: f.event.id });
    expect(out.status).toBe(409);
    expect(out.data!.message).toMatch(/1 stored file cannot go into the zip: .*source\.zip is missing from storage/);
  });

  it("the shuttle export lists passing entries only and zips the chosen layouts with a manifest that checks out", async () => {
    const { a, b } = await twoCompoParty();
    const sa = await withStoredFiles(a, ["pass", "warn", "fail"]);
    const sb = await withStoredFiles(b, ["pass", "fail", "fail"]);
    const page = await callRoute<any>(shuttlePage.loader, request(`/organize/events/${a.event.id}/shuttle`, { cookie: a.organizerCookie }), { eventId: a.event.id });
    expect(page.data.candidates.map((c: any) => c.entryId).sort()).toEqual([sa[0].entryId, sa[1].entryId, sb[0].entryId].sort());

    const chosen = [sa[1].entryId, sb[0].entryId];
    const { file, dir } = await download(shuttleZip.loader, `/organize/events/${a.event.id}/shuttle.zip?entry=${chosen[0]}&entry=${chosen[1]}`, { eventId: a.event.id }, a.organizerCookie);
    try {
      execFileSync("unzip", ["-q", file, "-d", join(dir, "x")]);
      const root = join(dir, "x", `${a.event.slug}-shuttle`);
      expect(execFileSync("sha256sum", ["-c", "--strict", "SHA256SUMS"], { cwd: root, encoding: "utf8" }).trim().split("\n")).toHaveLength(3);
      const manifest = JSON.parse(readFileSync(join(root, "shuttle-manifest.json"), "utf8"));
      expect(manifest.format).toBe("gatecrash-shuttle/1");
      expect(manifest.entries.map((m: any) => m.entry.id).sort()).toEqual([...chosen].sort());
      for (const m of manifest.entries) {
        const bytes = readFileSync(join(root, m.file));
        expect(createHash("sha256").update(bytes).digest("hex")).toBe(m.sha256);
        expect(bytes.length).toBe(m.bytes);
        expect(m.layout).toMatchObject({ topCell: "gc_entry", tileShape: "single" });
      }
      expect(readFileSync(join(root, manifest.entries.find((m: any) => m.entry.id === sa[1].entryId).file))).toEqual(sa[1].files.layout);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
    // A failed entry cannot be smuggled in.
    const refused = await callRoute(shuttleZip.loader, request(`/organize/events/${a.event.id}/shuttle.zip?entry=${sa[2].entryId}`, { cookie: a.organizerCookie }), { eventId: a.event.id });
    expect(refused.status).toBe(400);
    const stranger = await sessionCookie(await makeUser());
    expect((await callRoute(archiveRoute.loader, request(`/organize/events/${a.event.id}/archive.zip`, { cookie: stranger }), { eventId: a.event.id })).status).toBe(404);
  });
});
