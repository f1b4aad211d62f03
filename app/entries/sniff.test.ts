import { describe, expect, it } from "vitest";
import { checkKind, sniff } from "./sniff";

// Signatures from the format specifications named in sniff.ts.
const bytes = (...b: number[]) => Uint8Array.from(b);

describe("sniff", () => {
  it("recognises each accepted format by its first bytes", () => {
    expect(sniff(bytes(0x50, 0x4b, 0x03, 0x04, 0x14))).toBe("application/zip");
    expect(sniff(bytes(0x1f, 0x8b, 0x08))).toBe("application/gzip");
    expect(sniff(bytes(0x00, 0x06, 0x00, 0x02, 0x02, 0x58))).toBe("application/vnd.gdsii"); // HEADER, version 600
    expect(sniff(bytes(0x1a, 0x45, 0xdf, 0xa3, 0x9f))).toBe("video/webm");
    expect(sniff(bytes(0, 0, 0, 0x20, 0x66, 0x74, 0x79, 0x70, 0x69, 0x73, 0x6f, 0x6d))).toBe("video/mp4");
    expect(sniff(bytes(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a))).toBe("image/png");
    expect(sniff(bytes(0xff, 0xd8, 0xff, 0xe0))).toBe("image/jpeg");
    expect(sniff(bytes(0x3c, 0x68, 0x74))).toBeNull();
    expect(sniff(bytes())).toBeNull();
  });

  it("refuses bytes that do not match the claimed kind, saying what they are", () => {
    const png = bytes(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a);
    const r = checkKind("layout", "chip.gds", png);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/"chip.gds" is not a GDSII stream or a gzip file: it is a PNG picture/);
    expect(checkKind("still", "shot.png", png)).toEqual({ ok: true, mediaType: "image/png" });
    expect(checkKind("bundle", "src.tar.gz", bytes(0x1f, 0x8b, 8))).toEqual({ ok: true, mediaType: "application/gzip" });
    const text = checkKind("bundle", "top.v", Buffer.from("module top;"));
    expect(text.ok).toBe(false);
    if (!text.ok) expect(text.message).toMatch(/match none of the accepted formats/);
  });
});
