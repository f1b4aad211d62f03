import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";
import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll } from "vitest";
import { closeDb } from "~/db/client.server";

/** Debian's Chromium driven by playwright-core (no browser download), with the flags this closed network needs. */
export async function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: "/usr/bin/chromium",
    headless: true,
    args: ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run", "--disable-quic"],
  });
}

/**
 * One browser for the test file: launched before the first test, closed after the last one together with the
 * database pool (and whatever `alsoAfter` stops). Call the returned function inside tests.
 */
export function useBrowser(alsoAfter?: () => Promise<unknown>): () => Browser {
  let browser: Browser | undefined;
  beforeAll(async () => {
    browser = await launch();
  });
  afterAll(async () => {
    await browser?.close();
    await alsoAfter?.();
    await closeDb();
  });
  return () => {
    if (!browser) throw new Error("the browser is not launched yet: use it inside a test");
    return browser;
  };
}

export const baseUrl = (): string => {
  const u = process.env.APP_URL;
  if (!u) throw new Error("APP_URL is not set: run e2e tests through `npm test`");
  return u;
};

/** A browser context already signed in with the given session cookie (fixtures sign in directly). */
export async function contextWithCookie(browser: Browser, cookie?: string): Promise<BrowserContext> {
  const ctx = await browser.newContext({ baseURL: baseUrl(), viewport: { width: 1280, height: 860 } });
  if (cookie) {
    const url = new URL(baseUrl());
    await ctx.addCookies(
      cookie.split("; ").map((kv) => {
        const i = kv.indexOf("=");
        return { name: kv.slice(0, i), value: kv.slice(i + 1), domain: url.hostname, path: "/", httpOnly: true, sameSite: "Lax" as const };
      }),
    );
  }
  return ctx;
}

// Kept after the run (git-ignored) so a person can look at them.
const SHOTS = process.env.E2E_SCREENSHOTS ?? join(".gatecrash", "screenshots");

export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SHOTS, { recursive: true });
  const path = join(SHOTS, `${name}.png`);
  await page.screenshot({ path, fullPage: true });
  return path;
}

/** Polls `check` until it holds, with a deadline (e2e tests never sleep a fixed time). */
export async function pollUntil(page: Page, check: () => Promise<boolean>, what: string, timeoutMs = 30_000, everyMs = 250): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (await check()) return;
    await page.waitForTimeout(everyMs);
  }
  throw new Error(`timed out waiting for ${what}`);
}
