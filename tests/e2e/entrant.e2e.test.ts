import { execFileSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { eq } from "drizzle-orm";
import { PNG } from "pngjs";
import { describe, expect, it } from "vitest";
import { ZipFile } from "yazl";
import { TEST_RULESET } from "../support/rulesets";
import { db } from "~/db/client.server";
import { competitions, entries, eventRoles, events, uploadFiles, uploads } from "~/db/schema";
import { writeLayout } from "~/gdsii/writer";
import { waitForMail } from "../support/mail";
import { makeUser, sessionCookie, unique } from "../support/users";
import { contextWithCookie, pollUntil, screenshot, useBrowser } from "./browser";

const browser = useBrowser();

/** Small valid files of each kind, made here: a zip of a .v file, a GDSII stream, a WebM from ffmpeg, a PNG. */
async function makeFiles(dir: string) {
  const zip = new ZipFile();
  zip.addBuffer(Buffer.from("module gc_entry(input clk, input rst_n, output pwm_out);\n  assign pwm_out = 1'b0;\nendmodule\n"), "gc_entry.v");
  zip.end();
  const chunks: Buffer[] = [];
  for await (const c of zip.outputStream) chunks.push(c as Buffer);
  const bundle = join(dir, "beam-racer.zip");
  writeFileSync(bundle, Buffer.concat(chunks));
  const layout = join(dir, "beam-racer.gds");
  writeFileSync(
    layout,
    writeLayout({
      libName: "BEAM",
      userUnitsPerDbUnit: 0.001,
      metersPerDbUnit: 1e-9,
      structures: [{ name: "gc_entry", elements: [{ kind: "boundary", layer: 1, datatype: 0, points: [0, 0, 160000, 0, 160000, 100000, 0, 100000, 0, 0] }] }],
    }),
  );
  const video = join(dir, "capture.webm");
  execFileSync("ffmpeg", ["-hide_banner", "-loglevel", "error", "-f", "lavfi", "-i", "testsrc=size=64x48:rate=10:duration=1", "-c:v", "libvpx", "-y", video]);
  const png = new PNG({ width: 8, height: 8 });
  png.data.fill(200);
  const still = join(dir, "still.png");
  writeFileSync(still, PNG.sync.write(png));
  return { bundle, layout, video, still };
}

describe("an entrant in the browser", () => {
  it("creates a crew and an entry, pays on the payment page, uploads four files with progress, and gets both receipts", async () => {
    const [event] = await db().insert(events).values({ slug: unique("e2e-party"), title: "E2E Party", timeZone: "Europe/Berlin" }).returning();
    const [competition] = await db()
      .insert(competitions)
      .values({ eventId: event.id, slug: "tiny", title: "Tiny Compo", state: "open", deadlineAt: new Date(Date.now() + 3 * 86400_000), graceMinutes: 5, feeAmount: 1500, feeCurrency: "eur", ruleset: TEST_RULESET })
      .returning();
    const organizer = await makeUser({ name: "Orga" });
    await db().insert(eventRoles).values({ eventId: event.id, userId: organizer.id, role: "organizer" });
    const entrant = await makeUser({ name: "Beam Racer" });
    const ctx = await contextWithCookie(browser(), await sessionCookie(entrant));
    const page = await ctx.newPage();
    const pageErrors: string[] = [];
    page.on("pageerror", (e) => pageErrors.push(e.message));
    page.on("console", (m) => {
      if (m.type() === "error") pageErrors.push(m.text());
    });
    const enterPath = `/e/${event.slug}/tiny/enter`;

    // My entries offers the open compo and a crew; entering without a crew leads to the crew form and back.
    await page.goto("/my/entries");
    // The shared test database holds many compos of this title: pick this test's own by its link.
    await page.locator(`a[href="${enterPath}"]`).first().click();
    await page.waitForURL(new RegExp(`${enterPath}$`));
    await page.getByRole("link", { name: "Start a crew" }).click();
    await page.waitForURL(/\/crews\/new/);
    await page.getByLabel("Crew name").fill("Scanline Sisters");
    const handle = unique("scan").toLowerCase();
    await page.getByLabel("Handle").fill(handle);
    await screenshot(page, "entrant-crew-new");
    await page.getByRole("button", { name: "Create crew" }).click();
    await page.waitForURL(new RegExp(`${enterPath}$`));
    await page.getByLabel("Entry title").fill("Beam Racer");
    await page.getByLabel("Description").fill("Copper bars and a square-wave bass line.");
    await screenshot(page, "entrant-enter");
    await page.getByRole("button", { name: "Create entry" }).click();
    await page.waitForURL(/\/entries\/[0-9a-f-]{36}$/);
    const entryId = new URL(page.url()).pathname.split("/").pop()!;
    await screenshot(page, "entrant-dashboard-new");
    await page
      .getByTestId("countdown-value")
      .filter({ hasText: /\d+d \d\d:\d\d:\d\d/ })
      .waitFor({ timeout: 15_000 })
      .catch((e: Error) => {
        throw new Error(`${e.message}\npage errors: ${pageErrors.join("\n")}`);
      });
    expect(await page.getByTestId("fee-state").textContent()).toBe("Fee unpaid");

    // Pay on the payment fake's hosted page; its signed webhooks reach the app.
    await page.getByRole("button", { name: "Pay €15.00" }).click();
    await page.getByRole("button", { name: "Pay", exact: true }).waitFor();
    await screenshot(page, "entrant-payment-page");
    await page.getByRole("button", { name: "Pay", exact: true }).click();
    await page.waitForURL(new RegExp(`/entries/${entryId}\\?fee=returned`));
    await pollUntil(
      page,
      async () => {
        await page.reload();
        return (await page.getByTestId("fee-state").textContent()) === "Fee paid";
      },
      "the fee to show as paid",
    );

    // Four files, each with its own progress bar.
    const files = await makeFiles(mkdtempSync(join(tmpdir(), "gc-e2e-")));
    await page.getByLabel("Source bundle").setInputFiles(files.bundle);
    await page.getByLabel("Layout (GDSII)").setInputFiles(files.layout);
    await page.getByLabel("Capture video").setInputFiles(files.video);
    await page.getByLabel("Still picture").setInputFiles(files.still);
    await page.getByRole("button", { name: "Upload", exact: true }).click();
    await page.getByTestId("progress-bundle").waitFor();
    for (const k of ["bundle", "layout", "video", "still"]) await page.getByTestId(`progress-${k}`).waitFor();
    await page.getByText("Upload #1 is recorded and counts").waitFor({ timeout: 30_000 });
    await page.getByTestId("upload-1").waitFor();
    expect(await page.getByTestId("upload-1").textContent()).toContain("Counts");
    await screenshot(page, "entrant-dashboard-uploaded");

    // The stored files' hashes are the ones on the page and in the receipt.
    const [up] = await db().select().from(uploads).where(eq(uploads.entryId, entryId));
    expect(up).toMatchObject({ number: 1, state: "complete" });
    const stored = await db().select().from(uploadFiles).where(eq(uploadFiles.uploadId, up.id));
    expect(stored.map((f) => [f.kind, f.state]).sort()).toEqual([["bundle", "confirmed"], ["layout", "confirmed"], ["still", "confirmed"], ["video", "confirmed"]]);
    expect(stored.find((f) => f.kind === "video")!.mediaType).toBe("video/webm");
    const receipt = await waitForMail(entrant.email, /Upload receipt: Beam Racer, upload #1/, 30_000);
    for (const f of stored) {
      expect(receipt.text).toContain(f.sha256!);
      expect(await page.getByText(f.sha256!).count()).toBeGreaterThan(0);
    }
    const fee = await waitForMail(entrant.email, /Entry fee received: €15.00 for Beam Racer/, 30_000);
    expect(fee.text).toMatch(/Payment reference: pi_/);

    // The organizer sees the entry (read-only dashboard).
    const [row] = await db().select().from(entries).where(eq(entries.id, entryId));
    expect(row.feeState).toBe("paid");
    const orgCtx = await contextWithCookie(browser(), await sessionCookie(organizer));
    const orgPage = await orgCtx.newPage();
    await orgPage.goto(`/entries/${entryId}`);
    await orgPage.getByText("Organizer view (read-only)").waitFor();
    expect(await orgPage.getByRole("button", { name: "Upload", exact: true }).count()).toBe(0);
    await screenshot(orgPage, "entrant-dashboard-organizer");
    await orgCtx.close();
    await ctx.close();
  });
});
