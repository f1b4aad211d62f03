import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "~/db/client.server";
import { stopQueue } from "~/jobs/queue.server";
import * as showcaseRoute from "~/routes/showcase";
import * as entryRoute from "~/routes/showcase.entry";
import type { ShowcaseEntry } from "~/showcase/showcase.server";
import { callRoute } from "../support/routes";
import { makeUser, request, sessionCookie } from "../support/users";
import { addCheckRun, makeCompo, setCompetition } from "./showcase.fixtures";

afterAll(async () => {
  await stopQueue();
  await closeDb();
});

type ShowcaseData = { competition: { crewsHidden: boolean }; entries: ShowcaseEntry[]; ogImage: string | null };

describe("the public showcase", () => {
  it("lists active entries with a counting upload, never disqualified ones, and leaks nothing private", async () => {
    const f = await makeCompo({ state: "judging", blind: true });
    await addCheckRun(f.entries[0].uploadId, "pass");
    await addCheckRun(f.entries[1].uploadId, "warn", []);
    const out = await callRoute<ShowcaseData>(showcaseRoute.loader, request(`/e/${f.event.slug}/${f.slug}/showcase`), { eventSlug: f.event.slug, competitionSlug: f.slug });
    expect(out.status).toBe(200);
    const ids = out.data!.entries.map((e) => e.id).sort();
    expect(ids).toEqual(f.entries.map((e) => e.id).sort());
    const json = JSON.stringify(out.data);
    expect(json).not.toContain(f.disqualified.id);
    expect(json).not.toContain("Banned Beam");
    expect(json).not.toContain(f.noUpload.id);
    // Nothing private: no storage keys, file names, hashes, e-mails, reasons, scores or notes.
    for (const secret of ["s3Key", "private/", "secret-design.zip", "f".repeat(64), "@example.test", "secret reason", "private note", "objkey/", "orderSeed", "email"])
      expect(json, secret).not.toContain(secret);
    // Blind judging while in judging: no crew names.
    expect(out.data!.competition.crewsHidden).toBe(true);
    expect(out.data!.entries.every((e) => e.crew === null)).toBe(true);
    for (const e of f.entries) expect(json).not.toContain(e.crew);
    // Figures and the flash result come from the check run.
    const checked = out.data!.entries.find((e) => e.id === f.entries[0].id)!;
    expect(checked.stats).toMatchObject({ flipFlops: 140, cells: 2100, sourceLines: 321, tileShape: "single", utilization: 0.62 });
    expect(checked.flash.verdict).toBe("pass");
    expect(checked.referenceReady).toBe(true);
    expect(checked.media.referenceWebm).toMatch(/^\/artifacts\/[0-9a-f-]{36}$/);
    expect(out.data!.ogImage).toMatch(/^https?:\/\/.+\/artifacts\//);
    const flagged = out.data!.entries.find((e) => e.id === f.entries[1].id)!;
    expect(flagged.flash.verdict).toBe("warn");
    expect(flagged.flash.statement).toMatch(/FLAGGED/);
    expect(flagged.referenceReady).toBe(false);
    const unchecked = out.data!.entries.find((e) => e.id === f.entries[2].id)!;
    expect(unchecked.flash).toMatchObject({ verdict: null, statement: "Flash check: not measured yet." });
    expect(unchecked.check.state).toBe("none");
    // Shared presentation order: positions 1..n, the same on every call.
    expect(out.data!.entries.map((e) => e.position)).toEqual([1, 2, 3]);
    const again = await callRoute<ShowcaseData>(showcaseRoute.loader, request(`/e/${f.event.slug}/${f.slug}/showcase`), { eventSlug: f.event.slug, competitionSlug: f.slug });
    expect(again.data!.entries.map((e) => e.id)).toEqual(out.data!.entries.map((e) => e.id));
  });

  it("shows crews once results are out, and the entry page with its meta", async () => {
    const f = await makeCompo({ state: "results", blind: true });
    await addCheckRun(f.entries[0].uploadId, "pass");
    const params = { eventSlug: f.event.slug, competitionSlug: f.slug, entryId: f.entries[0].id };
    const out = await callRoute<{ entry: ShowcaseEntry; ogImage: string | null }>(entryRoute.loader, request(`/e/${f.event.slug}/${f.slug}/entries/${f.entries[0].id}`), params);
    expect(out.status).toBe(200);
    expect(out.data!.entry.crew).toBe(f.entries[0].crew);
    const meta = entryRoute.meta({ data: out.data } as never) as { title?: string; property?: string; content?: string }[];
    expect(meta.find((m) => m.title)?.title).toContain(f.entries[0].title);
    expect(meta.find((m) => m.property === "og:image")?.content).toMatch(/\/artifacts\//);
  });

  it("answers 404 for a disqualified entry, a draft or still-open competition", async () => {
    const f = await makeCompo({ state: "judging" });
    const dq = await callRoute(entryRoute.loader, request("/x"), { eventSlug: f.event.slug, competitionSlug: f.slug, entryId: f.disqualified.id });
    expect(dq.status).toBe(404);
    await setCompetition(f.competitionId, { state: "open" });
    expect((await callRoute(showcaseRoute.loader, request("/x"), { eventSlug: f.event.slug, competitionSlug: f.slug })).status).toBe(404);
    await setCompetition(f.competitionId, { state: "draft" });
    expect((await callRoute(showcaseRoute.loader, request("/x"), { eventSlug: f.event.slug, competitionSlug: f.slug })).status).toBe(404);
  });
});
