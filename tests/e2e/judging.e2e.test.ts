import { describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { db } from "~/db/client.server";
import { crewMembers } from "~/db/schema";
import { sessionCookie } from "../support/users";
import { makeCompo } from "../integration/judging-fixtures";
import { contextWithCookie, screenshot, useBrowser } from "./browser";

const browser = useBrowser();

/** Presses Tab until a grid cell has the focus (keyboard only, bounded). */
async function tabIntoGrid(page: Page): Promise<void> {
  for (let i = 0; i < 80; i++) {
    await page.keyboard.press("Tab");
    const inGrid = await page.evaluate(() => document.activeElement?.getAttribute("data-cell") ?? null);
    if (inGrid && inGrid.endsWith(":2")) return;
  }
  throw new Error("Tab never reached the first score cell of the grid");
}

async function waitForText(page: Page, testId: string, pattern: RegExp, timeoutMs = 20_000): Promise<void> {
  await page.waitForFunction(
    ([id, src]) => new RegExp(src).test(document.querySelector(`[data-testid="${id}"]`)?.textContent ?? ""),
    [testId, pattern.source] as const,
    { timeout: timeoutMs },
  );
}

async function scoreTexts(page: Page): Promise<string[][]> {
  return page.$$eval("table[role=grid] tbody tr", (rows) =>
    rows.map((r) => [...r.querySelectorAll("td[data-status]")].map((td) => (td.querySelector(".font-mono, .truncate")?.textContent ?? "").trim())),
  );
}

describe("judging in the browser", () => {
  it("a judge scores a whole compo with the keyboard alone, reloads and finds every score; the organizer's standings follow", async () => {
    const compo = await makeCompo({ judges: 2, entries: 4, title: "Keyboard Compo" });
    // Judge B is in the crew of the last entry: that row must be absent from their grid.
    await db().insert(crewMembers).values({ crewId: compo.entries[3].crewId, userId: compo.judges[0].id });

    const org = await contextWithCookie(browser(), await sessionCookie(compo.organizer));
    const orgPage = await org.newPage();
    await orgPage.goto(`/organize/${compo.competitionId}/standings`);
    await orgPage.getByTestId("ranking").waitFor();
    const before = await orgPage.$$eval("[data-testid=ranking] [data-testid=score]", (tds) => tds.map((t) => t.textContent?.trim()));
    expect(before.every((t) => t === "–")).toBe(true);

    const ctx = await contextWithCookie(browser(), await sessionCookie(compo.judges[0]));
    const page = await ctx.newPage();
    await page.goto(`/judging/${compo.competitionId}`);
    await page.getByRole("grid", { name: "Scoring grid" }).waitFor();
    const rowIds = await page.$$eval("table[role=grid] tbody tr", (rows) => rows.map((r) => r.getAttribute("data-entry-id")));
    expect(rowIds).toHaveLength(3);
    expect(rowIds).not.toContain(compo.entries[3].id);
    await waitForText(page, "progress", /0 of 3 entries scored/);

    // Visuals then Sound for each row, in the judge's order: digits and Tab only.
    const typed = [
      ["10", "6"],
      ["7", "8"],
      ["4", "5"],
    ];
    await tabIntoGrid(page);
    for (const row of typed) {
      for (const value of row) {
        for (const ch of value) await page.keyboard.press(ch);
        await page.keyboard.press("Tab");
      }
    }
    // A note on the last row: arrows to the note column, Enter to edit, Enter to save.
    await page.keyboard.press("ArrowRight");
    await page.keyboard.press("ArrowRight");
    await page.keyboard.press("Enter");
    await page.keyboard.type("tight sync, loud square wave");
    await page.keyboard.press("Enter");
    // A typing mistake undone with Escape does not change the saved score.
    await page.keyboard.press("ArrowUp");
    await page.keyboard.press("Home");
    await page.keyboard.press("ArrowRight");
    await page.keyboard.press("ArrowRight");
    await page.keyboard.press("9");
    await page.keyboard.press("Escape");

    await waitForText(page, "progress", /3 of 3 entries scored/);
    await waitForText(page, "save-status", /All changes saved/);
    await screenshot(page, "judging-grid-scored");

    await page.reload();
    await page.getByRole("grid", { name: "Scoring grid" }).waitFor();
    await waitForText(page, "progress", /3 of 3 entries scored/);
    const after = await scoreTexts(page);
    expect(after.map((r) => r.slice(0, 2))).toEqual(typed);
    expect(after[2][2]).toBe("tight sync, loud square wave");
    expect(await page.$$eval("table[role=grid] tbody tr", (rows) => rows.map((r) => r.getAttribute("data-entry-id")))).toEqual(rowIds);

    // The organizer's standings now rank the scored entries; weights Visuals 2, Sound 1:
    // first row (10·2 + 6)/3 = 8.667 on raw means (worked by hand).
    await orgPage.getByLabel("Raw means").check();
    await orgPage.getByRole("button", { name: "Use this method" }).click();
    await orgPage.waitForFunction(() => document.querySelector('[data-testid="ranking"] [data-testid="score"]')?.textContent?.trim() === "8.667");
    expect(await orgPage.textContent(`[data-testid="rank-${rowIds[0]}"]`)).toContain("8.667");
    await orgPage.getByTestId("distribution-chart").waitFor();
    await screenshot(orgPage, "judging-standings");
    await orgPage.goto(`/organize/${compo.competitionId}/jury`);
    await orgPage.getByTestId("conflict-list").waitFor();
    expect(await orgPage.getByTestId("conflict-list").textContent()).toContain("automatic");
    await screenshot(orgPage, "judging-organizer-jury");
    await orgPage.goto(`/organize/${compo.competitionId}/entries/${rowIds[2]}/history`);
    await orgPage.getByTestId("score-history").waitFor();
    expect(await orgPage.getByTestId("score-history").textContent()).toContain("tight sync, loud square wave");
    await screenshot(orgPage, "judging-history");
    // The judge's entry page: no capture yet, the not-ready state says so.
    await page.goto(`/judging/${compo.competitionId}/entries/${rowIds[0]}`);
    await page.getByTestId("capture-not-ready").waitFor();
    await screenshot(page, "judging-entry");
    await ctx.close();
    await org.close();
  });

  it("keeps a score typed while offline and saves it when the connection returns; a second tab's stale save shows the current value", async () => {
    const compo = await makeCompo({ judges: 1, entries: 2, title: "Flaky Wifi Compo" });
    const cookie = await sessionCookie(compo.judges[0]);
    const ctx = await contextWithCookie(browser(), cookie);
    const page = await ctx.newPage();
    await page.goto(`/judging/${compo.competitionId}`);
    await page.getByRole("grid", { name: "Scoring grid" }).waitFor();
    const other = await ctx.newPage();
    await other.goto(`/judging/${compo.competitionId}`);
    await other.getByRole("grid", { name: "Scoring grid" }).waitFor();

    await ctx.setOffline(true);
    await tabIntoGrid(page);
    await page.keyboard.press("6");
    await page.keyboard.press("Enter");
    await waitForText(page, "save-status", /not saved yet/);
    await screenshot(page, "judging-grid-offline");
    await ctx.setOffline(false);
    await waitForText(page, "save-status", /All changes saved/, 40_000);

    // The other tab still has version 0 for that cell.
    await tabIntoGrid(other);
    await other.keyboard.press("3");
    await other.keyboard.press("Enter");
    await waitForText(other, "conflicts", /saved elsewhere as 6/);
    await screenshot(other, "judging-grid-conflict");
    await other.getByRole("button", { name: "Take 6" }).click();
    await waitForText(other, "save-status", /All changes saved/);
    await ctx.close();
  });
});
