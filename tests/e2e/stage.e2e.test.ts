import { describe, expect, it } from "vitest";
import { publishResults } from "~/results/results.server";
import { castBallot } from "~/voting/voting.server";
import { makeUser } from "../support/users";
import { addCheckRun, addScores, makeCompo } from "../integration/showcase.fixtures";
import { contextWithCookie, screenshot, useBrowser } from "./browser";

const browser = useBrowser();

describe("stage mode on the big screen", () => {
  it("walks through every screen with the keyboard: intro, entries, vote, reveal from last to first; a flagged entry only on sign-off", async () => {
    const f = await makeCompo({ state: "judging", method: "points", entryCount: 3 });
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
    const counter = page.getByTestId("stage-counter");
    const totalScreens = async () => Number((await counter.textContent())!.split("/")[1].trim());

    // By default the flagged entry is held back: intro + 2 entries + vote + reveal intro + 3 reveals + end.
    await page.goto(`/stage/${f.competitionId}`);
    await page.getByTestId("stage-screen-intro").waitFor();
    expect(await totalScreens()).toBe(9);
    expect(await page.getByTestId("stage-screen-intro").textContent()).toContain("1 held back by the flash check");

    // The organizer signs off on the running order page, after its warning.
    await page.goto(`/organize/${f.competitionId}/stage`);
    const flaggedRow = page.getByTestId(`stage-order-${f.entries[1].id}`);
    expect(await flaggedRow.getAttribute("data-on-stage")).toBe("no");
    await flaggedRow.getByRole("checkbox").check();
    await flaggedRow.getByRole("button", { name: "Sign off and show it" }).click();
    await page.getByTestId("stage-order-message").waitFor();
    await flaggedRow.getByTestId("signed-off").waitFor();
    expect(await flaggedRow.getAttribute("data-on-stage")).toBe("yes");
    await screenshot(page, "stage-00-running-order-signed-off");

    await page.goto(`/stage/${f.competitionId}`);
    await page.getByTestId("stage-screen-intro").waitFor();
    const total = await totalScreens();
    // intro + warning slide + 3 entries + vote + reveal intro + 3 reveals + end
    expect(total).toBe(11);
    await screenshot(page, "stage-01-intro");

    const seen: string[] = [];
    for (let i = 2; i <= total; i++) {
      await page.keyboard.press(i % 2 === 0 ? "ArrowRight" : "Space");
      await page.waitForFunction((n) => document.querySelector('[data-testid="stage-counter"]')?.textContent?.startsWith(`${n} /`), i);
      const kind = (await page.locator('[data-testid^="stage-screen-"]').getAttribute("data-testid"))!.replace("stage-screen-", "");
      seen.push(kind);
      if (kind === "flash-warning") {
        expect(await page.getByTestId("stage-flash-warning").textContent()).toContain(f.entries[1].title);
        expect(await page.getByTestId("stage-signoff").textContent()).toContain(f.organizer.name);
        await screenshot(page, `stage-${String(i).padStart(2, "0")}-flash-warning`);
      } else if (kind === "entry") {
        const title = await page.getByTestId("stage-entry-title").textContent();
        const gate = page.getByTestId("photosensitivity-gate");
        await gate.waitFor();
        expect(await page.locator("video").count()).toBe(0);
        const flagged = title === f.entries[1].title;
        // the flagged entry comes right after its warning slide
        expect(seen.at(-2) === "flash-warning").toBe(flagged);
        expect(await page.getByTestId("stage-flash-flagged").count()).toBe(flagged ? 1 : 0);
        await screenshot(page, `stage-${String(i).padStart(2, "0")}-entry${flagged ? "-flagged" : ""}`);
        if (flagged) {
          await page.keyboard.press("Enter");
          const video = page.getByTestId("stage-video");
          await video.waitFor();
          // 1920×1080 at device pixel ratio 1: floor(min(1920/640, 1080/480)) = 2, so 1280×960 at (320, 60); never dimmed
          expect(await video.getAttribute("data-scale")).toBe("2");
          const box = await video.evaluate((v) => {
            const st = getComputedStyle(v);
            const r = v.getBoundingClientRect();
            return { x: r.x, y: r.y, w: r.width, h: r.height, rendering: st.imageRendering, opacity: st.opacity, filter: st.filter, muted: (v as HTMLVideoElement).muted, loop: (v as HTMLVideoElement).loop };
          });
          expect(box).toEqual({ x: 320, y: 60, w: 1280, h: 960, rendering: "pixelated", opacity: "1", filter: "none", muted: false, loop: false });
          await screenshot(page, `stage-${String(i).padStart(2, "0")}-entry-flagged-playing`);
          await page.keyboard.press("Escape");
          await page.getByTestId("stage-player").waitFor({ state: "detached" });
        }
      } else {
        if (kind === "vote") expect(await page.getByTestId("stage-qr").locator("svg").count()).toBe(1);
        await screenshot(page, `stage-${String(i).padStart(2, "0")}-${kind}`);
      }
    }
    expect(seen.filter((k) => k !== "flash-warning")).toEqual(["entry", "entry", "entry", "vote", "reveal-intro", "reveal", "reveal", "reveal", "end"]);
    expect(seen.filter((k) => k === "flash-warning")).toHaveLength(1);

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
