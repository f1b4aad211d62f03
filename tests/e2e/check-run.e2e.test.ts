import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { zipOf } from "../support/archives";
import { DEMO_RULESET } from "~/rules/ruleset";
import { queueCheckRun } from "~/conformance/queue.server";
import { generateDemoLayout } from "../support/demo-layout";
import { stopQueue } from "~/jobs/queue.server";
import { designPath } from "../../demo/designs/index";
import { makeCompetitionWithEntry, makeCompleteUpload } from "../support/entries";
import { makeEvent, makeUser, sessionCookie } from "../support/users";
import { contextWithCookie, screenshot, useBrowser } from "./browser";

const browser = useBrowser(stopQueue);

describe("the live check report on the entry page", () => {
  it("follows a queued run through the worker to its report, and plays the capture only after the warning", async () => {
    const event = await makeEvent("Check Party");
    const captain = await makeUser({ name: "Runner" });
    const { entry } = await makeCompetitionWithEntry({ eventId: event.id, captainId: captain.id, state: "open" });
    const upload = await makeCompleteUpload(entry.id, 1, [
      { kind: "bundle", bytes: await zipOf({ "copper.v": readFileSync(designPath("copper-sine")) }), filename: "copper.zip", mediaType: "application/zip" },
      { kind: "layout", bytes: generateDemoLayout({ ruleset: DEMO_RULESET, shape: "wide", flipFlops: 120, logicCells: 500, seed: 9 }).bytes, filename: "copper.gds", mediaType: "application/vnd.gdsii" },
    ]);
    await queueCheckRun(upload.id);

    const ctx = await contextWithCookie(browser(), await sessionCookie(captain));
    const page = await ctx.newPage();
    await page.goto(`/entries/${entry.id}`);
    const panel = page.getByTestId("check-run-panel");
    await panel.waitFor();
    const header = page.getByTestId("check-verdict");
    // The worker of the test stack takes the job; the panel polls the JSON API until the run is done.
    await page.locator('[data-testid="check-run-panel"][data-state="done"]').waitFor({ timeout: 180_000 });
    await expect(panel.locator('[data-rule="video.hsync.period"][data-verdict="pass"]').count()).resolves.toBe(1);
    await expect(panel.locator('[data-rule="layout.die.size"][data-verdict="pass"]').count()).resolves.toBe(1);
    await expect(panel.getByText(/not signoff/).count()).resolves.toBe(1);
    // the page's header card, rendered while the run was queued, follows the same live state without a reload
    await header.filter({ hasText: /^(pass|warn) · upload #1 · 0 fail/ }).waitFor({ timeout: 10_000 });
    const shown = (await panel.locator("header").textContent()) ?? "";
    expect(shown.toLowerCase()).toContain(((await header.textContent()) ?? "").split(" ")[0] === "pass" ? "pass" : "warning");
    await expect(panel.locator("video").count()).resolves.toBe(0);
    await panel.getByRole("button", { name: /I understand/ }).click();
    await panel.getByTestId("player-video").waitFor();
    await screenshot(page, "entry-check-report");
    await ctx.close();
  });
});
