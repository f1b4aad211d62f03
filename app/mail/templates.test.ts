import { describe, expect, it } from "vitest";
import { uploadReceiptMail, type UploadReceipt } from "./templates";

const base: UploadReceipt = {
  to: "crew@example.org",
  dedupeKey: "upload-receipt:u:m",
  number: 3,
  late: false,
  lateException: false,
  lateReason: null,
  entry: { id: "e1", title: "Night Bus" },
  crewName: "Lamp Post",
  competitionTitle: "Tiny Tile",
  event: { title: "Winter Gathering", timeZone: "Europe/Berlin" },
  // 2027-03-28 is the last Sunday of March: EU summer time starts at 01:00 UTC (Directive 2000/84/EC, art. 2).
  at: new Date("2027-03-28T01:30:00Z"),
  appUrl: "https://gatecrash.example",
  repository: null,
  licence: "MIT",
  // SHA-256("abc") from FIPS 180-2, appendix B.1 (only carried through here, not computed).
  files: [{ label: "Source bundle", filename: "night.zip", sizeBytes: 3, sizeText: "3 B", sha256: "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad" }],
};

describe("the upload receipt", () => {
  it("names the server time in UTC and in the event's zone, and lists every file with its SHA-256", () => {
    const m = uploadReceiptMail(base);
    expect(m.subject).toBe("Upload receipt: Night Bus, upload #3");
    expect(m.text).toContain("Server time: 2027-03-28T01:30:00.000Z (UTC)");
    // 01:30 UTC is 03:30 CEST (UTC+2) once summer time has begun at 01:00 UTC.
    expect(m.text).toMatch(/03:30:00 CEST \(Europe\/Berlin\)/);
    expect(m.text).toContain("Source bundle\n  night.zip\n  3 bytes (3 B)\n  SHA-256 ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    expect(m.text).toContain("Licence\n  MIT");
    expect(m.text).toContain("https://gatecrash.example/entries/e1");
    expect(m.dedupeKey).toBe("upload-receipt:u:m");
  });

  it("says a late upload does not count, and a repository upload names its commit", () => {
    const m = uploadReceiptMail({ ...base, late: true, repository: { url: "https://git.example/lamp/night.git", commit: "0123456789abcdef0123456789abcdef01234567" } });
    expect(m.subject).toBe("Late upload #3 for Night Bus (does not count)");
    expect(m.text).toContain("kept as late and is not judged");
    expect(m.text).toContain("https://git.example/lamp/night.git\n  commit 0123456789abcdef0123456789abcdef01234567");
    expect(m.text).toContain("the commit hash and the SHA-256 sums prove");
  });
});
