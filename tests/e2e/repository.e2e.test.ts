import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { DEMO_RULESET } from "~/rules/ruleset";
import { db } from "~/db/client.server";
import { competitions, crewMembers, crews, entries, eventRoles, events, uploads } from "~/db/schema";
import { designPath } from "../../demo/designs/index";
import { demoEntryLayout } from "../../demo/designs/layouts";
import { commitTree, startGitServer, type GitServer } from "../support/git-server";
import { waitForMail } from "../support/mail";
import { makeUser, sessionCookie, unique } from "../support/users";
import { contextWithCookie, pollUntil, screenshot, useBrowser } from "./browser";

let git: GitServer | null = null;
const browser = useBrowser(async () => git?.close());

describe("a crew that submits by repository link", () => {
  it("gives a link and a commit, sees the commit on its upload and its receipt, and the check run fetches it", async () => {
    // The crew's repository, served by git's own http-backend on loopback; a later commit sits on top of the one submitted.
    git = await startGitServer();
    const commit = commitTree(git, "scanline/beam.git", { "rtl/gc_entry.v": readFileSync(designPath("xor-tide")), "README.md": "Beam racer\n" }, undefined, {
      history: [{ "rtl/gc_entry.v": "// not finished yet\n" }],
    });
    const [event] = await db().insert(events).values({ slug: unique("repo-party"), title: "Repo Party", timeZone: "Europe/Berlin" }).returning();
    const [competition] = await db()
      .insert(competitions)
      .values({ eventId: event.id, slug: "tiny", title: "Tiny Compo", state: "open", deadlineAt: new Date(Date.now() + 3 * 86400_000), feeAmount: 0, feeCurrency: "eur", ruleset: { ...DEMO_RULESET, simulation: { ...DEMO_RULESET.simulation, frames: 2 }, flashCheck: { ...DEMO_RULESET.flashCheck, viewing: "desk" } } })
      .returning();
    const entrant = await makeUser({ name: "Scan Line" });
    const [crew] = await db().insert(crews).values({ handle: unique("scan"), name: "Scanline Sisters", createdBy: entrant.id }).returning();
    await db().insert(crewMembers).values({ crewId: crew.id, userId: entrant.id, role: "captain" });
    const [entry] = await db().insert(entries).values({ competitionId: competition.id, crewId: crew.id, title: "Beam Racer", feeState: "not_required" }).returning();
    const layoutPath = join(mkdtempSync(join(tmpdir(), "gc-e2e-repo-")), "beam.gds");
    writeFileSync(layoutPath, demoEntryLayout("xor-tide").bytes);

    const ctx = await contextWithCookie(browser(), await sessionCookie(entrant));
    const page = await ctx.newPage();
    await page.goto(`/entries/${entry.id}`);
    await page.getByLabel("a repository link and commit").check();
    await page.getByLabel(/^Repository link/).fill(git.url("scanline/beam.git"));
    await page.getByLabel(/^Commit \(full hash/).fill(commit);
    await page.getByLabel("Licence of your sources").fill("MIT");
    await page.getByLabel("Layout (GDSII)").setInputFiles(layoutPath);
    expect(await page.getByLabel("Source bundle").count()).toBe(0);
    await screenshot(page, "repository-upload-form");
    await page.getByRole("button", { name: "Upload", exact: true }).click();
    await page.getByText("Upload #1 is recorded and counts").waitFor({ timeout: 30_000 });
    const shown = page.getByTestId("upload-1-commit");
    await shown.waitFor();
    expect(await shown.textContent()).toContain(commit);

    const [up] = await db().select().from(uploads).where(eq(uploads.entryId, entry.id));
    expect(up).toMatchObject({ repositoryCommit: commit, licence: "MIT", state: "complete" });
    const receipt = await waitForMail(entrant.email, /Upload receipt: Beam Racer, upload #1/, 30_000);
    expect(receipt.text).toContain(`commit ${commit}`);
    expect(receipt.text).toContain(git.url("scanline/beam.git"));

    // The worker fetches exactly that commit (through the sandbox's one-host proxy) and checks it with its layout.
    // The report grows step by step (the repository finding comes first), so wait for the finished run before reading it.
    const finished = page.locator('[data-testid="check-run-panel"][data-state="done"]');
    await pollUntil(page, async () => (await finished.count()) > 0, "the finished check run", 240_000, 500);
    expect(await page.locator('[data-rule="intake.repository"][data-verdict="pass"]').count()).toBe(1);
    expect(await page.locator('[data-rule="layout.matches.flipflops"][data-verdict="pass"]').count()).toBe(1);
    expect(git.requests.some((r) => r.includes("scanline/beam.git") && r.includes("git-upload-pack"))).toBe(true);
    await screenshot(page, "repository-upload-checked");

    // The public rules page offers the ruleset and the starter bundle.
    await page.goto(`/e/${event.slug}/tiny`);
    await page.getByTestId("starter-downloads").waitFor();
    await screenshot(page, "rules-page-starter");
    const starter = await page.request.get(`/e/${event.slug}/tiny/starter.zip`);
    expect(starter.headers()["content-type"]).toBe("application/zip");
    expect((await starter.body()).subarray(0, 4)).toEqual(Buffer.from([0x50, 0x4b, 0x03, 0x04])); // PKWARE APPNOTE local file header
    const ruleset = (await (await page.request.get(`/e/${event.slug}/tiny/ruleset.json`)).json()) as { topModule: string };
    expect(ruleset.topModule).toBe(DEMO_RULESET.topModule);

    // The organizer sees the entry with the form for a late exception.
    const organizer = await makeUser({ name: "Ora Ganiser" });
    await db().insert(eventRoles).values({ eventId: event.id, userId: organizer.id, role: "organizer" });
    const orgCtx = await contextWithCookie(browser(), await sessionCookie(organizer));
    const orgPage = await orgCtx.newPage();
    await orgPage.goto(`/entries/${entry.id}`);
    await orgPage.getByRole("button", { name: "Grant exception" }).waitFor();
    await screenshot(orgPage, "entry-organizer-late-exception");
    await orgCtx.close();
    await ctx.close();
  }, 300_000);
});
