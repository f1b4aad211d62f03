import { describe, expect, it } from "vitest";
import { publishResults } from "~/results/results.server";
import { castBallot } from "~/voting/voting.server";
import { makeUser } from "../support/users";
import { addCheckRun, addScores, makeCompo } from "../integration/showcase.fixtures";
import { contextWithCookie, screenshot, useBrowser } from "./browser";

const browser = useBrowser();

describe("stage mode on the big screen", () => {
  it("walks through every screen with the keyboard: intro, entries, vote, reveal from last to first", async () => {
    const f = await makeCompo({ state: "judging", method: "points", entryCount: 3, stageFlashMode: "dim" });
    await addCheckRun(f.entries[0].uploadId, "pass");
    await addCheckRun(f.entries[1].uploadId, "warn");
    await addCheckRun(f.entries[2].uploadId, "pass");
    await addScores(f, [[[8, 7], [5, 6], [6, 3]]]);
    const u = await makeUser();
    await castBallot({ competitionId: f.competitionId, voter: { kind: "user", userId: u.id, emailVerified: true }, content: { points: { [f.entries[1].id]: 5 } } });
    const published = await publishResults(f.competitionId, f.organizer.id, "");
    const expectedReveal = [...published.payload.standings].reverse().map((r) => r.title);

    const ctx = await contextWithCookie(browser(), f.organizerCookie);
    const page = await ctx.newPage();
    await page.setViewportSize({ width: 1920, height: 1080 });
    await page.goto(`/stage/${f.competitionId}`);
    await page.getByTestId("stage-screen-intro").waitFor();
    const counter = page.getByTestId("stage-counter");
    const total = Number((await counter.textContent())!.split("/")[1].trim());
    // intro + 3 entries + vote + reveal intro + 3 reveals + end
    expect(total).toBe(10);
    await screenshot(page, "stage-01-intro");

    const seen: string[] = [];
    for (let i = 2; i <= total; i++) {
      await page.keyboard.press(i % 2 === 0 ? "ArrowRight" : "Space");
      await page.waitForFunction((n) => document.querySelector('[data-testid="stage-counter"]')?.textContent?.startsWith(`${n} /`), i);
      const kind = (await page.locator('[data-testid^="stage-screen-"]').getAttribute("data-testid"))!.replace("stage-screen-", "");
      seen.push(kind);
      if (kind === "entry") {
        const title = await page.getByTestId("stage-entry-title").textContent();
        const gate = page.getByTestId("photosensitivity-gate");
        await gate.waitFor();
        expect(await page.locator("video").count()).toBe(0);
        const flagged = title === f.entries[1].title;
        expect(await page.getByTestId("stage-flash-warning").count()).toBe(flagged ? 1 : 0);
        await screenshot(page, `stage-${String(i).padStart(2, "0")}-entry${flagged ? "-flagged" : ""}`);
        if (flagged) {
          await page.keyboard.press("Enter");
          await page.getByTestId("stage-video").waitFor();
          expect(await page.getByTestId("stage-video").getAttribute("class")).toContain("opacity-40");
          await screenshot(page, `stage-${String(i).padStart(2, "0")}-entry-flagged-playing`);
        }
      } else {
        if (kind === "vote") expect(await page.getByTestId("stage-qr").locator("svg").count()).toBe(1);
        await screenshot(page, `stage-${String(i).padStart(2, "0")}-${kind}`);
      }
    }
    expect(seen).toEqual(["entry", "entry", "entry", "vote", "reveal-intro", "reveal", "reveal", "reveal", "end"]);

    // Back and Home.
    await page.keyboard.press("ArrowLeft");
    await page.waitForFunction((n) => document.querySelector('[data-testid="stage-counter"]')?.textContent?.startsWith(`${n} /`), total - 1);
    expect(await page.getByTestId("stage-reveal").textContent()).toContain(expectedReveal[expectedReveal.length - 1]);
    await page.keyboard.press("ArrowLeft");
    await page.keyboard.press("ArrowLeft");
    await page.waitForFunction((n) => document.querySelector('[data-testid="stage-counter"]')?.textContent?.startsWith(`${n} /`), total - 3);
    expect(await page.getByTestId("stage-reveal").textContent()).toContain(expectedReveal[0]);
    await page.keyboard.press("Home");
    await page.getByTestId("stage-screen-intro").waitFor();
    await ctx.close();
  });
});
