import { describe, expect, it } from "vitest";
import { encodeReal8, readReal8 } from "./real8";

const hex = (b: Uint8Array) => Array.from(b, (x) => x.toString(16).padStart(2, "0").toUpperCase()).join(" ");
const bytes = (h: string) => new Uint8Array(h.split(" ").map((x) => parseInt(x, 16)));

describe("8-byte excess-64 reals", () => {
  it("encodes 1e-3 as the manual's check value", () => {
    // GDSII Stream Format Manual, release 6.0, UNITS example: 1E-3 = 3E 41 89 37 4B C6 A7 EF.
    expect(hex(encodeReal8(1e-3))).toBe("3E 41 89 37 4B C6 A7 EF");
  });

  it("decodes the manual's 1e-3 bytes back to 0.001", () => {
    // Same source as above.
    expect(readReal8(new DataView(bytes("3E 41 89 37 4B C6 A7 EF").buffer), 0)).toBe(0.001);
  });

  it("decodes 1 and -2 by the format's definition", () => {
    // Manual 6.0 definition: 1 = 16^1 × 1/16 → exponent 0x41, fraction 0x10…; sign bit for negatives.
    expect(readReal8(new DataView(bytes("41 10 00 00 00 00 00 00").buffer), 0)).toBe(1);
    expect(readReal8(new DataView(bytes("C1 20 00 00 00 00 00 00").buffer), 0)).toBe(-2);
    expect(hex(encodeReal8(1))).toBe("41 10 00 00 00 00 00 00");
    expect(hex(encodeReal8(-2))).toBe("C1 20 00 00 00 00 00 00");
    expect(hex(encodeReal8(0))).toBe("00 00 00 00 00 00 00 00");
  });

  it("decodes the bytes KLayout writes for 1e-9 m to exactly 1e-9", () => {
    // Bytes taken from a UNITS record written by Debian's klayout 0.28.5 (1 nm database unit).
    expect(readReal8(new DataView(bytes("39 44 B8 2F A0 9B 5A 54").buffer), 0)).toBe(1e-9);
  });

  it("round-trips angles, magnifications and tiny and huge values", () => {
    for (const v of [90, 180, 270, 37, 123.5, 2.5, 0.5, 1e-9, 5e-10, 1e-6, 12345.678, -0.001, 1e70, 1e-70]) {
      const b = encodeReal8(v);
      expect(readReal8(new DataView(b.buffer), 0)).toBe(v);
    }
  });

  it("refuses values a GDSII real cannot hold", () => {
    expect(() => encodeReal8(Infinity)).toThrow(RangeError);
    expect(() => encodeReal8(1e80)).toThrow(RangeError);
  });
});
