import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { makeUser } from "../support/users";
import { contextWithCookie, useBrowser } from "./browser";

/**
 * The content security policy in a real browser: the page hydrates (React Router's inline scripts carry the
 * nonce), a form submits through the client router, and Chromium reports no policy violation.
 */
const browser = useBrowser();

function watchViolations(page: Page): string[] {
  const seen: string[] = [];
  page.on("console", (m) => {
    if (/Content Security Policy|Refused to/i.test(m.text())) seen.push(m.text());
  });
  page.on("pageerror", (e) => seen.push(`pageerror: ${e.message}`));
  return seen;
}

async function waitForHydration(page: Page): Promise<void> {
  await page.waitForFunction(() => Boolean((window as unknown as { __reactRouterDataRouter?: unknown }).__reactRouterDataRouter), undefined, { timeout: 15_000 });
}

describe("the app under its content security policy", () => {
  it("hydrates, signs in through the client router, and breaks no policy", async () => {
    const u = await makeUser({ name: "Policy Tester" });
    const ctx = await contextWithCookie(browser());
    const page = await ctx.newPage();
    const violations = watchViolations(page);
    await page.addInitScript(() => {
      const w = window as unknown as { __csp: string[] };
      w.__csp = [];
      document.addEventListener("securitypolicyviolation", (e) => w.__csp.push(`${e.violatedDirective} ${e.blockedURI}`));
    });

    const res = await page.goto("/sign-in");
    expect(res?.headers()["content-security-policy"]).toMatch(/script-src 'self' 'nonce-/);
    await waitForHydration(page);

    const dataRequests: string[] = [];
    page.on("request", (r) => {
      if (r.url().includes(".data")) dataRequests.push(r.url());
    });
    await page.getByLabel("E-mail").fill(u.email);
    await page.getByLabel("Password").fill(u.password);
    await page.getByRole("button", { name: /sign in/i }).click();
    await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"), { timeout: 15_000 });
    await page.getByText("Policy Tester").first().waitFor({ timeout: 15_000 });
    // The post went through the hydrated router (a .data request), not a full-page fallback.
    expect(dataRequests.length).toBeGreaterThan(0);

    // Another page, reached by a client-side navigation, still without violations.
    await page.goto("/events");
    await waitForHydration(page);
    const inPage = await page.evaluate(() => (window as unknown as { __csp: string[] }).__csp);
    expect([...violations, ...inPage]).toEqual([]);
    await ctx.close();
  });
});
