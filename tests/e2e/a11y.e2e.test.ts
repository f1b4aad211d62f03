import { createRequire } from "node:module";
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { juryAssignments } from "~/db/schema";
import { makeCompo } from "../integration/showcase.fixtures";
import { grantEventRole, makeUser, sessionCookie } from "../support/users";
import { contextWithCookie, useBrowser } from "./browser";

/**
 * axe-core (its own source injected into each page; Playwright's evaluate is not bound by the page's CSP) on every
 * main page, signed in as whoever sees it: no serious or critical violation.
 */
const require = createRequire(import.meta.url);
const axeSource: string = (require("axe-core") as { source: string }).source;

const browser = useBrowser();

interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[] }[];
}

async function seriousViolations(page: Page): Promise<string[]> {
  await page.evaluate(axeSource);
  const violations = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run(ctx: Document, opts: unknown): Promise<{ violations: AxeViolation[] }> } }).axe;
    const r = await axe.run(document, { resultTypes: ["violations"] });
    return r.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.slice(0, 3).map((n) => ({ target: n.target })) }));
  });
  return violations.filter((v) => v.impact === "serious" || v.impact === "critical").map((v) => `${v.id} (${v.impact}): ${v.help} — ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`);
}

async function waitHydrated(page: Page) {
  await page.waitForFunction(() => Boolean((window as unknown as { __reactRouterDataRouter?: unknown }).__reactRouterDataRouter), undefined, { timeout: 15_000 });
}

describe("accessibility of the main pages", () => {
  it("has no serious or critical axe violations on any of them", async () => {
    const f = await makeCompo({ state: "judging" });
    const judge = await makeUser({ name: "Axe Judge" });
    await grantEventRole(f.event.id, judge.id, "judge");
    await db().insert(juryAssignments).values({ competitionId: f.competitionId, judgeUserId: judge.id });
    const audience = await makeUser({ name: "Axe Audience" });
    const base = `/e/${f.event.slug}/${f.slug}`;
    const visits: { who: string; cookie?: string; paths: string[] }[] = [
      { who: "anonymous", paths: ["/", "/sign-in", "/sign-up", "/events", base, `${base}/showcase`, `${base}/entries/${f.entries[0].id}`] },
      { who: "audience", cookie: await sessionCookie(audience), paths: ["/", `${base}/vote`] },
      { who: "entrant", cookie: await sessionCookie(f.entries[0].member), paths: ["/my/entries", `/entries/${f.entries[0].id}`] },
      { who: "organizer", cookie: f.organizerCookie, paths: ["/organize", `/organize/${f.competitionId}`, `/organize/${f.competitionId}/entries`, `/organize/${f.competitionId}/jury`, `/organize/${f.competitionId}/standings`] },
      { who: "judge", cookie: await sessionCookie(judge), paths: ["/judging", `/judging/${f.competitionId}`] },
    ];
    const problems: string[] = [];
    for (const v of visits) {
      const ctx = await contextWithCookie(browser(), v.cookie);
      const page = await ctx.newPage();
      for (const path of v.paths) {
        const res = await page.goto(path);
        expect(res?.status(), `${v.who} ${path}`).toBeLessThan(400);
        await waitHydrated(page);
        for (const p of await seriousViolations(page)) problems.push(`${v.who} ${path}: ${p}`);
      }
      await ctx.close();
    }
    expect(problems).toEqual([]);
  });
});
