import { createHash } from "node:crypto";
import postgres from "postgres";
import { and, eq, like, sql } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "~/db/client.server";
import { checkRuns, outbox, uploadFiles, uploads } from "~/db/schema";
import { stopQueue } from "~/jobs/queue.server";
import { MIN_PART_BYTES } from "~/entries/parts";
import { confirmFile } from "~/entries/multipart.server";
import { uploadForUploader } from "~/entries/upload-access.server";
import { completeUpload, startUpload, sweepStaleUploads } from "~/entries/uploads.server";
import { rulesetOf } from "~/entries/service.server";
import { hashObject, headObject } from "~/storage/s3.server";
import { TEST_RULESET } from "../support/rulesets";
import * as startApi from "~/routes/api.entries.$entryId.uploads";
import * as uploadApi from "~/routes/api.uploads.$uploadId";
import * as fileApi from "~/routes/api.uploads.$uploadId.files.$fileId";
import * as filesApi from "~/routes/api.uploads.$uploadId.files";
import { makeUser, request, sessionCookie } from "../support/users";
import { callApi, makeEntrySetup } from "./entries-support";
import { complete, confirm, sendParts, start, type Planned } from "./upload-api";
import { wallTimeInstant } from "../support/time";


afterAll(async () => {
  await stopQueue();
  await closeDb();
});

// Small valid heads of each format (signatures from the specs named in app/entries/sniff.ts).
const GDS = Buffer.from([0x00, 0x06, 0x00, 0x02, 0x02, 0x58, 0x00, 0x1c, 0x01, 0x02]);
const ZIP = Buffer.concat([Buffer.from([0x50, 0x4b, 0x03, 0x04]), Buffer.from("not really deflated but the head is a zip")]);
const PNG = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]);

/** Polls (with a deadline, no fixed sleep) until `n` sessions of this database wait for a row lock on uploads or entries. */
async function lockWaiters(n: number, timeoutMs = 20_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    const rows = await db().execute<{ n: number }>(
      sql`select count(*)::int as n from pg_stat_activity where datname = current_database() and wait_event_type = 'Lock' and query ~* '(uploads|entries).*for update'`,
    );
    if (rows[0].n >= n) return;
    await new Promise((r) => setTimeout(r, 20));
  }
  throw new Error(`fewer than ${n} sessions waited for the lock within ${timeoutMs} ms`);
}

/** A whole upload of bundle + layout through the API. */
async function uploadPair(s: Awaited<ReturnType<typeof makeEntrySetup>>, bundle = ZIP, layout = GDS) {
  const st = await start(s, [
    { kind: "bundle", filename: "design.zip", size: bundle.length },
    { kind: "layout", filename: "design.gds", size: layout.length },
  ]);
  expect(st.status).toBe(201);
  for (const f of st.body.files) {
    const bytes = f.kind === "bundle" ? bundle : layout;
    await sendParts(s.cookie, st.body.uploadId, f, bytes);
    expect((await confirm(s.cookie, st.body.uploadId, f)).status).toBe(200);
  }
  return st.body.uploadId;
}

describe("SHA-256 through the real S3 fake and hashObject", () => {
  it('hashes "abc" to the FIPS 180-2 example value', async () => {
    // FIPS 180-2, Appendix B.1: SHA-256("abc").
    const FIPS_ABC = "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad";
    const s = await makeEntrySetup();
    // A still whose bytes are a PNG signature followed by nothing else would be refused as a bundle; here we hash "abc" as a raw object.
    const st = await start(s, [
      { kind: "bundle", filename: "abc.zip", size: 3 },
      { kind: "layout", filename: "a.gds", size: GDS.length },
    ]);
    const bundle = st.body.files.find((f) => f.kind === "bundle")!;
    await sendParts(s.cookie, st.body.uploadId, bundle, Buffer.from("abc"));
    const out = await confirm(s.cookie, st.body.uploadId, bundle);
    // "abc" is not a zip: refused by sniffing, but only after the stored object was hashed from S3.
    expect(out.status).toBe(422);
    expect(out.body.error.message).toMatch(/"abc.zip" is not a zip archive or a gzip file/);
    const [row] = await db().select().from(uploadFiles).where(eq(uploadFiles.id, bundle.id));
    expect(row.state).toBe("rejected");
    expect(await headObject(row.s3Key)).toBeNull(); // the refused object is gone
    // The streaming hash itself, on an object holding exactly "abc":
    const { putObject } = await import("~/storage/s3.server");
    await putObject(`tests/abc-${bundle.id}`, "abc", "application/octet-stream");
    const h = await hashObject(`tests/abc-${bundle.id}`);
    expect(h).toMatchObject({ sha256: FIPS_ABC, size: 3 });
  });

  it("records the hash of a confirmed file as computed from the stored bytes", async () => {
    const s = await makeEntrySetup();
    const uploadId = await uploadPair(s);
    const files = await db().select().from(uploadFiles).where(eq(uploadFiles.uploadId, uploadId));
    const bundle = files.find((f) => f.kind === "bundle")!;
    expect(bundle.sha256).toBe(createHash("sha256").update(ZIP).digest("hex"));
    expect(bundle.sizeBytes).toBe(ZIP.length);
    expect(bundle.mediaType).toBe("application/zip");
    expect(files.find((f) => f.kind === "layout")!.mediaType).toBe("application/vnd.gdsii");
  });
});

describe("a complete upload", () => {
  it("gets the next number, queues a check run, and mails a receipt with every file's name, size and SHA-256", async () => {
    const s = await makeEntrySetup();
    const first = await complete(s.cookie, await uploadPair(s));
    expect(first.status).toBe(200);
    expect(first.body).toMatchObject({ number: 1, state: "complete" });
    const secondId = await uploadPair(s);
    const second = await complete(s.cookie, secondId);
    expect(second.body).toMatchObject({ number: 2, state: "complete" });
    // Completing again answers the same, changes nothing.
    const again = await complete(s.cookie, secondId);
    expect(again.body).toMatchObject({ number: 2, state: "complete", already: true });
    expect(await db().select().from(checkRuns).where(eq(checkRuns.uploadId, secondId))).toHaveLength(1);
    const [mail] = await db().select().from(outbox).where(and(eq(outbox.toAddress, s.entrant.email), like(outbox.subject, "Upload receipt%#2")));
    expect(mail.textBody).toContain("design.zip");
    expect(mail.textBody).toContain(`${ZIP.length} bytes`);
    expect(mail.textBody).toContain(createHash("sha256").update(GDS).digest("hex"));
    expect(mail.textBody).toMatch(/Server time: \d{4}-\d\d-\d\dT/);
  });

  it("serializes racing completions: one number per upload, never one number for two uploads", async () => {
    const s = await makeEntrySetup();
    // Two different uploads both ready to complete at once. Starting the second discards the first (and deletes its
    // stored objects), so the first is put back to pending by hand: completing reads only the rows, and the point
    // here is the entry lock that hands out numbers, not how two uploads came to be ready.
    const a = await uploadPair(s);
    const b = await uploadPair(s);
    await db().update(uploads).set({ state: "pending" }).where(eq(uploads.id, a));
    // Both completions must really be in flight together: a connection of the test's own holds both upload rows
    // until both requests wait for a lock, then lets go. Without the entry lock in completeUpload both would read
    // the same highest number and one would hit the unique index (a 500 here); with it they take turns.
    const holder = postgres(process.env.DATABASE_URL!, { max: 1, onnotice: () => {} });
    const racing = await holder
      .begin(async (t) => {
        await t`select id from uploads where id in (${a}, ${b}) for update`;
        const both = Promise.all([complete(s.cookie, a), complete(s.cookie, b)]);
        await lockWaiters(2);
        return { both }; // not awaited in here: they wait for this transaction to end
      })
      .finally(() => holder.end());
    const [ra, rb] = await racing.both;
    expect([ra.status, rb.status]).toEqual([200, 200]);
    expect([ra.body.number, rb.body.number].sort()).toEqual([1, 2]);
    expect([ra.body.state, rb.body.state]).toEqual(["complete", "complete"]);
    // The same upload completed twice in parallel: both answers 200 with the one number it got, one of them "already".
    const c = await uploadPair(s);
    const [r1, r2] = await Promise.all([complete(s.cookie, c), complete(s.cookie, c)]);
    expect([r1.status, r2.status]).toEqual([200, 200]);
    expect([r1.body.number, r2.body.number]).toEqual([3, 3]);
    expect([Boolean(r1.body.already), Boolean(r2.body.already)].sort()).toEqual([false, true]);
    const rows = await db().select().from(uploads).where(eq(uploads.entryId, s.entry.id));
    expect(rows.filter((r) => r.state === "complete").map((r) => r.number).sort()).toEqual([1, 2, 3]);
  });

  it("refuses to complete without bundle and layout, and refuses a file whose bytes do not match its kind", async () => {
    const s = await makeEntrySetup();
    const missing = await start(s, [{ kind: "bundle", filename: "d.zip", size: 10 }]);
    expect(missing.status).toBe(400);
    expect(missing.body.error?.fieldErrors?.layout?.[0]).toMatch(/required/);
    const st = await start(s, [
      { kind: "bundle", filename: "d.zip", size: ZIP.length },
      { kind: "layout", filename: "shot.gds", size: PNG.length },
    ]);
    const layout = st.body.files.find((f) => f.kind === "layout")!;
    await sendParts(s.cookie, st.body.uploadId, layout, PNG);
    const refused = await confirm(s.cookie, st.body.uploadId, layout);
    expect(refused.status).toBe(422);
    expect(refused.body.error.message).toBe('"shot.gds" is not a GDSII stream or a gzip file: it is a PNG picture. Choose the right file for "Layout (GDSII), .gds or .gds.gz".');
    const notYet = await complete(s.cookie, st.body.uploadId);
    expect(notYet.status).toBe(409);
    // The bundle is kept; the entrant replaces only the refused layout, and the upload completes.
    const bundle = st.body.files.find((f) => f.kind === "bundle")!;
    await sendParts(s.cookie, st.body.uploadId, bundle, ZIP);
    expect((await confirm(s.cookie, st.body.uploadId, bundle)).status).toBe(200);
    const replaced = await callApi<{ file: Planned }>(filesApi.action, request(`/api/uploads/${st.body.uploadId}/files`, { cookie: s.cookie, json: { kind: "layout", filename: "real.gds", size: GDS.length } }), {
      uploadId: st.body.uploadId,
    });
    expect(replaced.status).toBe(201);
    await sendParts(s.cookie, st.body.uploadId, replaced.body.file, GDS);
    expect((await confirm(s.cookie, st.body.uploadId, replaced.body.file)).status).toBe(200);
    expect((await complete(s.cookie, st.body.uploadId)).body).toMatchObject({ number: 1, state: "complete" });
  });

  it("refuses an oversized claim before any byte is sent, and an object larger than the limit after upload", async () => {
    const ruleset = { ...TEST_RULESET, uploadLimits: { ...TEST_RULESET.uploadLimits, layoutBytes: 64 } };
    const s = await makeEntrySetup({ ruleset });
    const before = await start(s, [
      { kind: "bundle", filename: "d.zip", size: ZIP.length },
      { kind: "layout", filename: "huge.gds", size: 65 },
    ]);
    expect(before.status).toBe(400);
    expect(before.body.error?.fieldErrors?.layout?.[0]).toMatch(/"huge.gds" is 65 B; this compo allows at most 64 B/);
    expect(await db().select().from(uploads).where(eq(uploads.entryId, s.entry.id))).toHaveLength(0);
    // A browser that claims 60 bytes but stores 200 is caught on the stored size.
    const st = await start(s, [
      { kind: "bundle", filename: "d.zip", size: ZIP.length },
      { kind: "layout", filename: "liar.gds", size: 60 },
    ]);
    const layout = st.body.files.find((f) => f.kind === "layout")!;
    await sendParts(s.cookie, st.body.uploadId, layout, Buffer.concat([GDS, Buffer.alloc(190)]), [1]);
    const out = await confirm(s.cookie, st.body.uploadId, layout);
    expect(out.status).toBe(422);
    expect(out.body.error.message).toMatch(/200 B as stored/);
  });

  it("lets only the crew reach an upload; other people get 404", async () => {
    const s = await makeEntrySetup();
    const stranger = await sessionCookie(await makeUser());
    const st = await start(s, [
      { kind: "bundle", filename: "d.zip", size: ZIP.length },
      { kind: "layout", filename: "d.gds", size: GDS.length },
    ]);
    const f = st.body.files[0];
    expect((await callApi(uploadApi.loader, request(`/api/uploads/${st.body.uploadId}`, { cookie: stranger }), { uploadId: st.body.uploadId })).status).toBe(404);
    expect((await callApi(fileApi.action, request("/x", { cookie: stranger, json: { action: "sign", partNumbers: [1] } }), { uploadId: st.body.uploadId, fileId: f.id })).status).toBe(404);
    // access is settled before the body is read: a stranger's malformed body is a 404 too, never a 400 naming fields
    expect((await callApi(startApi.action, request("/x", { cookie: stranger, json: { files: [] } }), { entryId: s.entry.id })).status).toBe(404);
    expect((await callApi(filesApi.action, request("/x", { cookie: stranger, json: { kind: "nonsense" } }), { uploadId: st.body.uploadId })).status).toBe(404);
    expect((await callApi(filesApi.action, request("/x", { cookie: s.cookie, json: { kind: "nonsense" } }), { uploadId: st.body.uploadId })).status).toBe(400);
    expect((await callApi(startApi.action, request("/x", { cookie: stranger, json: { files: [{ kind: "bundle", filename: "a", size: 1 }] } }), { entryId: s.entry.id })).status).toBe(404);
    expect((await callApi(uploadApi.loader, request(`/api/uploads/${st.body.uploadId}`), { uploadId: st.body.uploadId })).status).toBe(401);
  });
});

describe("broken and resumed uploads", () => {
  it("an upload that dies half way leaves no recorded upload; a resumed one ends with the right hash", async () => {
    const s = await makeEntrySetup();
    // 5 MiB + a bit: two parts (S3 parts are at least 5 MiB except the last).
    const big = Buffer.alloc(MIN_PART_BYTES + 12345);
    ZIP.copy(big);
    for (let i = ZIP.length; i < big.length; i++) big[i] = (i * 31) & 0xff;
    const st = await start(s, [
      { kind: "bundle", filename: "big.zip", size: big.length },
      { kind: "layout", filename: "d.gds", size: GDS.length },
    ]);
    const bundle = st.body.files.find((f) => f.kind === "bundle")!;
    expect(bundle.partCount).toBe(2);
    await sendParts(s.cookie, st.body.uploadId, bundle, big, [1]); // the connection breaks after part 1

    // Half way: nothing is recorded, the entry has no counting upload, the dashboard lists nothing.
    const early = await complete(s.cookie, st.body.uploadId);
    expect(early.status).toBe(409);
    const notReady = await confirm(s.cookie, st.body.uploadId, bundle);
    expect(notReady.status).toBe(409);
    expect(notReady.body.error.message).toMatch(/Parts 2 of "big.zip" are not stored yet/);
    const rows = await db().select().from(uploads).where(eq(uploads.entryId, s.entry.id));
    expect(rows.map((r) => r.state)).toEqual(["pending"]);
    expect(rows[0].number).toBeLessThan(0);

    // Resume: the browser asks which parts are stored and sends only the rest.
    const stored = await callApi<{ parts: { partNumber: number; size: number }[] }>(fileApi.loader, request(`/api/uploads/${st.body.uploadId}/files/${bundle.id}`, { cookie: s.cookie }), {
      uploadId: st.body.uploadId,
      fileId: bundle.id,
    });
    expect(stored.body.parts).toMatchObject([{ partNumber: 1, size: MIN_PART_BYTES }]);
    await sendParts(s.cookie, st.body.uploadId, bundle, big, [2]);
    const ok = await confirm(s.cookie, st.body.uploadId, bundle);
    expect(ok.status).toBe(200);
    expect(ok.body.file.sha256).toBe(createHash("sha256").update(big).digest("hex"));
    expect(ok.body.file.sizeBytes).toBe(big.length);
    const layout = st.body.files.find((f) => f.kind === "layout")!;
    await sendParts(s.cookie, st.body.uploadId, layout, GDS);
    await confirm(s.cookie, st.body.uploadId, layout);
    expect((await complete(s.cookie, st.body.uploadId)).body).toMatchObject({ number: 1, state: "complete" });
  });

  it("abandons an unfinished upload when a new one starts, and sweeps stale ones, aborting their parts", async () => {
    const s = await makeEntrySetup();
    const first = await start(s, [
      { kind: "bundle", filename: "d.zip", size: ZIP.length },
      { kind: "layout", filename: "d.gds", size: GDS.length },
    ]);
    const bundle = first.body.files.find((f) => f.kind === "bundle")!;
    await sendParts(s.cookie, first.body.uploadId, bundle, ZIP);
    await start(s, [
      { kind: "bundle", filename: "d.zip", size: ZIP.length },
      { kind: "layout", filename: "d.gds", size: GDS.length },
    ]);
    const [old] = await db().select().from(uploads).where(eq(uploads.id, first.body.uploadId));
    expect(old.state).toBe("abandoned");
    // Its file takes no more parts (the multipart upload was aborted where the store supports it).
    const [file] = await db().select().from(uploadFiles).where(eq(uploadFiles.id, bundle.id));
    expect(file.multipartUploadId).toBeNull();
    const sign = await callApi(fileApi.action, request("/x", { cookie: s.cookie, json: { action: "sign", partNumbers: [1] } }), { uploadId: first.body.uploadId, fileId: bundle.id });
    expect(sign.status).toBe(409);
    const discarded = await complete(s.cookie, first.body.uploadId);
    expect(discarded.body.error.code).toBe("upload_discarded");
    // The sweep: the second one, left untouched for two days. Only uploads older than a day are swept, so
    // the other test files' uploads in flight in the same database are left alone.
    await db().update(uploads).set({ createdAt: new Date(Date.now() - 2 * 86400_000) }).where(and(eq(uploads.entryId, s.entry.id), eq(uploads.state, "pending")));
    const swept = await sweepStaleUploads(86400_000);
    expect(swept).toBeGreaterThanOrEqual(1);
    const states = (await db().select().from(uploads).where(eq(uploads.entryId, s.entry.id))).map((u) => u.state);
    expect(states).toEqual(["abandoned", "abandoned"]);
  });
});

describe("the deadline, decided on the server at completion time", () => {
  async function readyUpload(s: Awaited<ReturnType<typeof makeEntrySetup>>, now: Date) {
    const st = await startUpload(s.entry.id, s.entrant.id, [
      { kind: "bundle", filename: "d.zip", size: ZIP.length },
      { kind: "layout", filename: "d.gds", size: GDS.length },
    ], now);
    for (const f of st.files) await sendParts(s.cookie, st.uploadId, f, f.kind === "bundle" ? ZIP : GDS);
    const up = await uploadForUploader(st.uploadId, s.entrant.id);
    for (const f of await db().select().from(uploadFiles).where(eq(uploadFiles.uploadId, st.uploadId))) {
      const r = await confirmFile(f, rulesetOf(up!.competition.ruleset));
      expect(r.file.sha256).toMatch(/^[0-9a-f]{64}$/);
    }
    return st.uploadId;
  }

  it("just before the cutoff counts; at and after it the upload is late, kept, never complete", async () => {
    const deadline = new Date(Date.now() + 3600_000);
    const s = await makeEntrySetup({ deadlineAt: deadline, graceMinutes: 10 });
    const cutoff = deadline.getTime() + 10 * 60_000;
    const early = new Date(deadline.getTime() - 60_000);
    const r1 = await completeUpload(await readyUpload(s, early), s.entrant.id, new Date(cutoff - 1));
    expect(r1.upload).toMatchObject({ number: 1, state: "complete" });
    const r2 = await completeUpload(await readyUpload(s, early), s.entrant.id, new Date(cutoff));
    expect(r2.upload).toMatchObject({ number: 2, state: "late" });
    expect(r2.upload.message).toMatch(/after the deadline/);
    const r3 = await completeUpload(await readyUpload(s, early), s.entrant.id, new Date(cutoff + 1000));
    expect(r3.upload.state).toBe("late");
    // Late ones get no check run and do not count; upload #1 still does.
    const { countingUpload } = await import("~/conformance/report.server");
    expect((await countingUpload(s.entry.id))?.number).toBe(1);
    expect((await db().select().from(checkRuns).where(eq(checkRuns.uploadId, r2.upload.uploadId)))).toHaveLength(0);
    const [lateMail] = await db().select().from(outbox).where(and(eq(outbox.toAddress, s.entrant.email), like(outbox.subject, "Late upload #2%")));
    expect(lateMail.textBody).toMatch(/not judged/);
    // Starting a new upload after the cutoff is refused with a clear message.
    const after = startUpload(s.entry.id, s.entrant.id, [{ kind: "bundle", filename: "d.zip", size: 3 }, { kind: "layout", filename: "d.gds", size: 3 }], new Date(cutoff));
    await expect(after).rejects.toMatchObject({ status: 409, code: "deadline_passed", message: expect.stringMatching(/The deadline passed at .* Uploads are closed/) });
  });

  it("a deadline on the daylight-saving change in the event's zone (reference: the IANA tz database through Intl)", async () => {
    // Europe/Berlin, 2027-03-28: 02:00 CET jumps to 03:00 CEST. The organizer's deadline is 03:00 local.
    const deadline = wallTimeInstant("2027-03-28T03:00", "Europe/Berlin");
    const inBerlin = new Intl.DateTimeFormat("en-GB", { timeZone: "Europe/Berlin", timeStyle: "long", hourCycle: "h23" }).format(deadline);
    expect(inBerlin).toMatch(/^03:00:00 (CEST|GMT\+2)$/);
    const s = await makeEntrySetup({ deadlineAt: deadline, timeZone: "Europe/Berlin" });
    const oneSecondBefore = wallTimeInstant("2027-03-28T01:59:59", "Europe/Berlin"); // CET, one real second earlier
    const setup = new Date(deadline.getTime() - 3 * 3600_000);
    const ok = await completeUpload(await readyUpload(s, setup), s.entrant.id, oneSecondBefore);
    expect(ok.upload.state).toBe("complete");
    const at = await completeUpload(await readyUpload(s, setup), s.entrant.id, deadline);
    expect(at.upload.state).toBe("late");
    // An hour "later" on the wall clock is not an hour later in real time here: 02:59:59 CET never happened.
    expect(() => wallTimeInstant("2027-03-28T02:59:59", "Europe/Berlin")).toThrow(/does not exist/);
  });
});
