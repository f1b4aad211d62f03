import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { checkRuns, competitions, crewMembers, crews, entries, uploads } from "~/db/schema";
import { makeUser, sessionCookie, unique } from "../support/users";
import { contextWithCookie, screenshot, useBrowser } from "./browser";

const browser = useBrowser();

/** Polls until the value matches, with a deadline (no fixed sleeps). */
async function eventually<T>(read: () => Promise<T>, want: T, timeoutMs = 10_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  let last: T | undefined;
  while (Date.now() < until) {
    last = await read();
    if (last === want) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  expect(last).toBe(want);
}

/** A wall-clock time about a month ahead, as a datetime-local input takes it. */
function monthAhead(): string {
  const d = new Date(Date.now() + 30 * 86_400_000);
  return `${d.getUTCFullYear()}-${String(d.getUTCMonth() + 1).padStart(2, "0")}-${String(d.getUTCDate()).padStart(2, "0")}T20:00`;
}

describe("the organizer in the browser", () => {
  it("announces an event and a compo with a ruleset, opens it, and reads the public rules page", async () => {
    const organizer = await makeUser({ name: "Mira Org" });
    const ctx = await contextWithCookie(browser(), await sessionCookie(organizer));
    const page = await ctx.newPage();

    await page.goto("/organize/events/new");
    const eventTitle = `Harbour Static ${unique("e").slice(-6)}`;
    await page.getByLabel("Event title").fill(eventTitle);
    await page.getByLabel("Venue").fill("Pier 4 (invented)");
    await page.getByLabel("Time zone").fill("Europe/Berlin");
    await page.getByRole("button", { name: "Create event" }).click();
    await page.waitForURL(/\/organize\/events\/[0-9a-f-]{36}$/);

    await page.getByRole("link", { name: "New compo" }).click();
    await page.waitForURL(/competitions\/new$/);
    await page.getByTestId("competition-form").waitFor();
    // A wrong field first: the error appears beside it and the other values stay.
    await page.getByLabel("Title", { exact: true }).fill("Tiny Beam Compo");
    await page.getByLabel("Top module name").fill("9bad");
    await page.getByRole("button", { name: "Create compo" }).click();
    await page.getByText("A Verilog module name.").waitFor();
    await expect(page.getByLabel("Title", { exact: true }).inputValue()).resolves.toBe("Tiny Beam Compo");
    await screenshot(page, "organize-competition-form-error");

    await page.getByLabel("Top module name").fill("beam_top");
    await page.getByLabel("Submission deadline").fill(monthAhead());
    await page.getByLabel("Amount").fill("12.50");
    await page.getByRole("button", { name: "Create compo" }).click();
    await page.getByText("“Free entry” is ticked").waitFor(); // a fee with "free" ticked is a contradiction, said beside the field
    await page.getByLabel("Free entry").uncheck();
    await page.getByLabel("Currency (ISO 4217)").fill("EUR");
    // Pin rows: add one, then take it away again.
    const pinRows = page.getByRole("table", { name: "Pin list" }).locator("tbody tr");
    await expect(pinRows.count()).resolves.toBe(8);
    await page.getByRole("button", { name: "Add a pin" }).click();
    await page.getByLabel("Pin 9 name").fill("dbg");
    await expect(pinRows.count()).resolves.toBe(9);
    await page.getByRole("button", { name: "Remove pin 9" }).click();
    await page.getByLabel("Pin 9 name").waitFor({ state: "detached" });
    await page.getByLabel("Allowed shapes").fill("single=1x1, pair=2x1");
    await page.getByLabel("Flip-flop budget").fill("160");
    await screenshot(page, "organize-competition-form");
    await page.getByRole("button", { name: "Create compo" }).click();
    await page.waitForURL(/\/organize\/[0-9a-f-]{36}$/);
    await page.getByTestId("competition-dashboard").waitFor();

    await page.getByRole("button", { name: "Open for entries" }).click();
    await page.getByText("Open for entries", { exact: true }).first().waitFor();
    await page.getByRole("button", { name: "Close entries now" }).waitFor();
    await screenshot(page, "organize-dashboard-open");

    await page.getByRole("link", { name: "Public rules page" }).click();
    await page.getByTestId("rules-page").waitFor();
    await expect(page.getByTestId("pin-table").locator("tbody tr").count()).resolves.toBe(8);
    await expect(page.getByText("beam_top").first().isVisible()).resolves.toBe(true);
    await expect(page.getByTestId("fee").textContent()).resolves.toBe("€12.50");
    await expect(page.getByTestId("tile-shapes").getAttribute("aria-label")).resolves.toContain("pair is 360 by 120 µm, 0.0432 mm²");
    await page.getByTestId("visitor-time").first().waitFor(); // filled in after hydration, on the visitor's clock
    await expect(page.getByRole("link", { name: "Enter this compo" }).count()).resolves.toBe(1);
    await screenshot(page, "rules-page");
    const cal = await page.request.get(page.url() + "/calendar.ics");
    expect(cal.headers()["content-type"]).toBe("text/calendar; charset=utf-8");
    await ctx.close();
  });

  it("sorts, filters and narrows the entries table, and disqualifies with a reason", async () => {
    const organizer = await makeUser({ name: "Table Org" });
    const cookie = await sessionCookie(organizer);
    const ctx = await contextWithCookie(browser(), cookie);
    const page = await ctx.newPage();
    await page.goto("/organize/events/new");
    await page.getByLabel("Event title").fill(`Table Party ${unique("t").slice(-6)}`);
    await page.getByLabel("Time zone").fill("Europe/Berlin");
    await page.getByRole("button", { name: "Create event" }).click();
    await page.waitForURL(/\/organize\/events\/[0-9a-f-]{36}$/);
    await page.getByRole("link", { name: "New compo" }).click();
    await page.waitForURL(/competitions\/new$/);
    await page.getByLabel("Title", { exact: true }).fill("Table Compo");
    await page.getByLabel("Free entry").check();
    await page.getByRole("button", { name: "Create compo" }).click();
    await page.waitForURL(/\/organize\/[0-9a-f-]{36}$/);
    const competitionId = page.url().split("/").pop()!;
    const [comp] = await db().select().from(competitions).where(eq(competitions.id, competitionId));
    expect(comp.feeAmount).toBe(0);

    // Demo-like entries (invented crews), with uploads and check verdicts.
    const demo = [
      { handle: "scanline-cats", title: "Copper Dreams", verdict: "pass" as const, fee: "paid" as const },
      { handle: "vblank-vandals", title: "Plasma Harbour", verdict: "fail" as const, fee: "paid" as const },
      { handle: "flipflop-folk", title: "Sixty-Four Colours", verdict: "warn" as const, fee: "unpaid" as const },
    ];
    for (const d of demo) {
      const member = await makeUser({ name: `${d.handle} captain` });
      const [crew] = await db().insert(crews).values({ handle: `${d.handle}-${unique("x").slice(-5)}`, name: d.handle }).returning();
      await db().insert(crewMembers).values({ crewId: crew.id, userId: member.id, role: "captain" });
      const [entry] = await db().insert(entries).values({ competitionId, crewId: crew.id, title: d.title, feeState: d.fee }).returning();
      const [up] = await db().insert(uploads).values({ entryId: entry.id, number: 1, state: "complete", completedAt: new Date() }).returning();
      await db().insert(checkRuns).values({ uploadId: up.id, state: "done", verdict: d.verdict });
    }

    await page.goto(`/organize/${competitionId}/entries`);
    const table = page.getByTestId("entries-table");
    await table.waitFor();
    await expect(table.locator("tbody tr").count()).resolves.toBe(3);
    await expect(table.locator("tbody tr").first().textContent()).resolves.toContain("flipflop-folk");
    await table.getByRole("button", { name: /Title/ }).click();
    await eventually(async () => (await table.locator("tbody tr").first().textContent())?.includes("Copper Dreams"), true);
    await table.getByRole("button", { name: /Title/ }).click();
    await eventually(async () => (await table.locator("tbody tr").first().textContent())?.includes("Sixty-Four Colours"), true);
    await page.getByRole("combobox", { name: "Check run" }).selectOption("fail");
    await eventually(() => table.locator("tbody tr").count(), 1);
    await page.getByRole("combobox", { name: "Check run" }).selectOption("");
    await page.getByLabel("Search crew or title").fill("plasma");
    await eventually(() => page.getByTestId("entries-shown").textContent(), "1 of 3 entries");
    await page.getByLabel("Search crew or title").fill("");
    await eventually(() => page.getByTestId("entries-shown").textContent(), "3 of 3 entries");
    await page.getByRole("group", { name: "Columns" }).getByLabel("Fee").uncheck();
    await eventually(async () => (await table.locator("thead th").allTextContents()).some((t) => t.startsWith("Fee")), false);
    await screenshot(page, "organize-entries-table");

    const row = table.locator("tbody tr", { hasText: "Plasma Harbour" });
    await row.getByText("Disqualify…").click();
    await row.getByLabel("Reason (mailed to the crew)").fill("Three tiles used; the ruleset allows two.");
    await row.getByRole("button", { name: /^Disqualify / }).click();
    await page.getByRole("status").filter({ hasText: "Disqualified" }).waitFor();
    await eventually(async () => (await table.locator("tbody tr", { hasText: "Plasma Harbour" }).textContent())?.includes("disqualified"), true);
    await expect(table.locator("tbody tr", { hasText: "Copper Dreams" }).getByRole("button", { name: "Refund" }).count()).resolves.toBe(1);
    await screenshot(page, "organize-entries-disqualified");
    await ctx.close();
  });
});
