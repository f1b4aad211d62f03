import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { publishResults } from "~/results/results.server";
import { twoCompoParty, withStoredFiles } from "../integration/party.fixtures";
import { addScores, setCompetition } from "../integration/showcase.fixtures";
import { contextWithCookie, screenshot, useBrowser } from "./browser";

const browser = useBrowser();
const HOUR = 3600_000;

describe("the party around the compos", () => {
  it("the organizer gives an award, prints party codes, shows the timetable, and downloads an archive whose manifest checks out", async () => {
    const { a, b } = await twoCompoParty();
    await withStoredFiles(a, ["pass", "pass", "warn"]);
    await withStoredFiles(b, ["pass", "fail", "pass"]);
    await addScores(a, [[[7, 7], [9, 9], [3, 3]]]);
    const t0 = Date.now() + 48 * HOUR;
    await setCompetition(b.competitionId, { showStartsAt: new Date(t0), showMinutes: 40 });

    const ctx = await contextWithCookie(browser(), a.organizerCookie);
    const page = await ctx.newPage();
    await page.goto(`/organize/events/${a.event.id}/party`);
    await page.getByLabel("Award", { exact: true }).last().fill("Best sound");
    await page.getByLabel("Winner").last().selectOption({ label: `${a.entries[0].title} by ${a.entries[0].crew} (Alpha Beam)` });
    await page.getByRole("button", { name: "Add award" }).click();
    await page.getByRole("status").filter({ hasText: "Award added." }).waitFor();
    await page.getByLabel("How many new codes").fill("4");
    await page.getByRole("button", { name: "Generate party codes" }).click();
    await page.getByRole("status").filter({ hasText: "4 party-wide codes made." }).waitFor();
    await screenshot(page, "party-desk");

    const sheet = await page.request.get(`/organize/events/${a.event.id}/party/codes`);
    const html = await sheet.text();
    expect(html.match(/class="slip"/g)).toHaveLength(4);
    expect(html).toContain("Votes in: Alpha Beam · Bravo Tone");

    // The results page and the stage show the award once Alpha Beam's results are out.
    await publishResults(a.competitionId, a.organizer.id, "");
    await page.goto(`/e/${a.event.slug}/${a.slug}/results`);
    await page.getByTestId("results-awards").getByText("Best sound").waitFor();
    await screenshot(page, "results-with-award");
    await page.goto(`/e/${a.event.slug}`);
    await page.getByTestId("timetable").waitFor();
    await expect(page.getByTestId("timetable").locator('tr[data-kind="show"]').count()).resolves.toBe(1);
    await page.getByTestId("party-awards").getByText("Best sound").waitFor();
    await screenshot(page, "party-page");

    await page.goto(`/organize/events/${a.event.id}/party`);
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByTestId("archive-link").click()]);
    const dir = mkdtempSync(join(tmpdir(), "gc-e2e-archive-"));
    try {
      const file = join(dir, download.suggestedFilename());
      await download.saveAs(file);
      expect(download.suggestedFilename()).toBe(`${a.event.slug}-archive.zip`);
      // Independent tools: Info-ZIP unzip and GNU coreutils sha256sum read the archive and its manifest.
      execFileSync("unzip", ["-q", file, "-d", join(dir, "x")]);
      const root = join(dir, "x", `${a.event.slug}-archive`);
      const out = execFileSync("sha256sum", ["-c", "--strict", "SHA256SUMS"], { cwd: root, encoding: "utf8" }).trim().split("\n");
      expect(out.length).toBe(6 * 7 + 1);
      expect(out.every((l) => l.endsWith(": OK"))).toBe(true);
      const info = readFileSync(join(root, `${a.slug}`, execFileSync("ls", [join(root, a.slug)], { encoding: "utf8" }).split("\n").find((d) => d.length)!, "info.txt"), "utf8");
      expect(info).toMatch(/^Title: /);
      expect(info).toMatch(/Place: \d/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
    await ctx.close();
  });
});
