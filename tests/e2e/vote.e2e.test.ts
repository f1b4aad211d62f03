import { describe, expect, it } from "vitest";
import { publishedResults } from "~/results/results.server";
import { generateVoteCodes } from "~/voting/voting.server";
import { waitForMail } from "../support/mail";
import { makeUser, sessionCookie } from "../support/users";
import { addCheckRun, addScores, makeCompo } from "../integration/showcase.fixtures";
import { contextWithCookie, screenshot, useBrowser } from "./browser";

const browser = useBrowser();

describe("showcase, audience vote and published results in the browser", () => {
  it("an audience member watches and votes, a code-holder votes, the organizer publishes, results and e-mails agree", async () => {
    const f = await makeCompo({ state: "judging", method: "schulze", blind: true, entryCount: 3, juryWeightPct: 50 });
    await addCheckRun(f.entries[0].uploadId, "pass");
    await addCheckRun(f.entries[1].uploadId, "warn");
    await addScores(f, [
      [[7, 6], [5, 5], [4, 8]],
      [[6, 6], [6, 4], [5, 7]],
    ]);
    const base = `/e/${f.event.slug}/${f.slug}`;

    // The audience member: showcase, entry page behind the warning, then the ranked ballot by keyboard.
    const voter = await makeUser({ name: "Hall Voter" });
    const ctx = await contextWithCookie(browser(), await sessionCookie(voter));
    const page = await ctx.newPage();
    await page.goto(`${base}/showcase`);
    await page.getByTestId("showcase-entries").waitFor();
    expect(await page.getByTestId("showcase-entries").locator("li").count()).toBe(3);
    expect(await page.getByText("Banned Beam").count()).toBe(0);
    await screenshot(page, "showcase-grid");

    await page.goto(`${base}/entries/${f.entries[1].id}`);
    const gate = page.getByTestId("photosensitivity-gate").first();
    await gate.waitFor();
    expect(await gate.getByTestId("flash-statement").textContent()).toMatch(/FLAGGED/);
    expect(await page.locator("video").count()).toBe(0); // nothing loads before the viewer accepts
    await screenshot(page, "showcase-entry-gate");
    await gate.getByRole("button", { name: /I understand/ }).click();
    await page.getByTestId("player-video").waitFor();
    expect(await page.getByTestId("audio-caution").count()).toBeGreaterThan(0);
    await screenshot(page, "showcase-entry-accepted");

    await page.goto(`${base}/vote`);
    await page.getByTestId("ranked-ballot").waitFor();
    const titles = async () => page.getByTestId("ranked-item").locator("div.flex-1 > span.font-extrabold").allTextContents();
    const start = await titles();
    // Keyboard only: focus the first entry's "down" button and press Enter twice; focus follows the entry.
    await page.getByRole("button", { name: `Move ${start[0]} down` }).focus();
    await page.keyboard.press("Enter");
    await page.keyboard.press("Enter");
    const moved = await titles();
    expect(moved).toEqual([start[1], start[2], start[0]]);
    await screenshot(page, "vote-ranked");
    await page.getByRole("button", { name: "Cast my ballot" }).click();
    await page.getByTestId("vote-saved").waitFor();
    expect(await page.getByTestId("vote-saved").textContent()).toMatch(/ballot is in/);
    await screenshot(page, "vote-saved");
    await ctx.close();

    // A code-holder at the party: a wrong code is refused, the right one casts.
    const [code] = await generateVoteCodes(f.competitionId, 1);
    const anon = await contextWithCookie(browser());
    const p2 = await anon.newPage();
    await p2.goto(`${base}/vote`);
    await p2.getByLabel("Vote code").fill("ZZZZ-ZZZZ");
    await p2.getByRole("button", { name: "Cast my ballot" }).click();
    await p2.getByText(/does not vote in this compo/).waitFor();
    await screenshot(p2, "vote-wrong-code");
    await p2.getByLabel("Vote code").fill(code.toLowerCase());
    await p2.getByRole("button", { name: "Cast my ballot" }).click();
    await p2.getByTestId("vote-saved").waitFor();
    // The same browser may change its ballot (the code field is gone now).
    await p2.reload();
    expect(await p2.getByLabel("Vote code").count()).toBe(0);
    await anon.close();

    // The organizer: live count, then preview and publish.
    const org = await contextWithCookie(browser(), f.organizerCookie);
    const op = await org.newPage();
    await op.goto(`/organize/${f.competitionId}/audience`);
    const countBox = op.getByTestId("live-count");
    await countBox.waitFor();
    expect(await countBox.textContent()).toMatch(/Ballots2From accounts1From codes1/);
    await screenshot(op, "organizer-audience");
    await op.goto(`/organize/${f.competitionId}/results`);
    await op.getByTestId("standings").waitFor();
    await screenshot(op, "organizer-results-preview");
    await op.getByLabel(/I checked the preview/).check();
    await op.getByRole("button", { name: "Publish results" }).click();
    await op.getByTestId("published").waitFor();
    await screenshot(op, "organizer-results-published");
    await org.close();

    // The public results page shows what was frozen; the e-mails say the same places.
    const snap = (await publishedResults(f.competitionId))!;
    const pub = await contextWithCookie(browser());
    const rp = await pub.newPage();
    await rp.goto(`${base}/results`);
    await rp.getByTestId("standings").waitFor();
    const rows = await rp.getByTestId("standing-row").allTextContents();
    expect(rows).toHaveLength(3);
    snap.payload.standings.forEach((r, i) => expect(rows[i]).toContain(r.title));
    expect(await rp.getByTestId("results-sha").textContent()).toBe(snap.sha256);
    expect(await rp.getByTestId("money-caution").count()).toBe(1);
    await screenshot(rp, "results-public");
    await pub.close();

    for (const e of f.entries) {
      const row = snap.payload.standings.find((r) => r.entryId === e.id)!;
      const mail = await waitForMail(e.member.email, /Results:/, 30_000);
      expect(mail.subject).toContain(`placed ${row.place}${row.tied ? "=" : ""} in`);
      expect(mail.text).toContain(`${base}/results?version=1`);
    }
  });
});
