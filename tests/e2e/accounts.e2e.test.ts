import { describe, expect, it } from "vitest";
import { firstLink, waitForMail } from "../support/mail";
import { grantEventRole, makeEvent, makeUser, sessionCookie, unique } from "../support/users";
import { contextWithCookie, screenshot, useBrowser } from "./browser";
import { crewMembers, crews } from "~/db/schema";
import { db } from "~/db/client.server";

const browser = useBrowser();

describe("accounts in the browser", () => {
  it("signs up, reads the verification mail from the catcher, verifies, and lands signed in", async () => {
    const ctx = await contextWithCookie(browser());
    const page = await ctx.newPage();
    const email = `${unique("e2e")}@example.test`;
    await page.goto("/sign-up");
    await page.getByLabel("Name or handle").fill("Beam Chaser");
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill("a-very-long-password");
    await page.getByRole("button", { name: "Create account" }).click();
    await page.waitForURL(/check-your-mail/);
    await screenshot(page, "accounts-check-mail");

    // The worker sends the outbox mail to the SMTP catcher; we read it through the catcher's API.
    const mail = await waitForMail(email, /Confirm your e-mail/, 30_000);
    await page.goto(firstLink(mail));
    await page.waitForURL(/welcome/);
    await expect(page.getByTestId("welcome").textContent()).resolves.toContain("Beam Chaser");
    await page.goto("/");
    await expect(page.getByTestId("home-audience").isVisible()).resolves.toBe(true);
    await expect(page.getByRole("link", { name: "Organize" }).count()).resolves.toBe(0);
    await screenshot(page, "home-audience");
    await ctx.close();
  });

  it("shows each role its own home and navigation", async () => {
    const event = await makeEvent("E2E Party");
    const [organizer, judge, entrant] = await Promise.all([makeUser({ name: "Org" }), makeUser({ name: "Jude" }), makeUser({ name: "Enzo" })]);
    await grantEventRole(event.id, organizer.id, "organizer");
    await grantEventRole(event.id, judge.id, "judge");
    const [crew] = await db().insert(crews).values({ handle: unique("crew"), name: "Test Crew" }).returning();
    await db().insert(crewMembers).values({ crewId: crew.id, userId: entrant.id, role: "captain" });

    for (const [who, u, testId, nav] of [
      ["organizer", organizer, "home-organizer", "Organize"],
      ["judge", judge, "home-judge", "Judging"],
      ["entrant", entrant, "home-entrant", "My entries"],
    ] as const) {
      const ctx = await contextWithCookie(browser(), await sessionCookie(u));
      const page = await ctx.newPage();
      await page.goto("/");
      await expect(page.getByTestId(testId).isVisible(), who).resolves.toBe(true);
      await expect(page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: nav }).count(), who).resolves.toBe(1);
      await screenshot(page, `home-${who}`);
      await ctx.close();
    }
  });

  it("signs in through the form and signs out again", async () => {
    const u = await makeUser({ name: "Formy" });
    const ctx = await contextWithCookie(browser());
    const page = await ctx.newPage();
    await page.goto("/sign-in?next=/my/entries");
    await page.getByLabel("E-mail").fill(u.email);
    await page.getByLabel("Password").fill(u.password);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(/\/my\/entries$/);
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL((url) => url.pathname === "/");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Sign in" }).waitFor({ timeout: 10_000 });
    // A reload proves the session cookie is gone, not just the page state.
    await page.reload();
    await expect(page.getByRole("button", { name: "Sign out" }).count()).resolves.toBe(0);
    await ctx.close();
  });
});
