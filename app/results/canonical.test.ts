import { describe, expect, it } from "vitest";
import { canonicalJson, payloadHash, sha256Hex } from "./canonical";

describe("canonical JSON", () => {
  it("sorts keys at every depth and drops undefined members", () => {
    expect(canonicalJson({ b: 1, a: { d: [3, { z: 1, y: 2 }], c: undefined } })).toBe('{"a":{"d":[3,{"y":2,"z":1}]},"b":1}');
  });

  it("hashes equal objects alike whatever their key order", () => {
    expect(payloadHash({ x: 1, y: [1, 2] })).toBe(payloadHash({ y: [1, 2], x: 1 }));
    expect(payloadHash({ x: 1 })).not.toBe(payloadHash({ x: 2 }));
  });

  it("refuses numbers JSON cannot carry", () => {
    expect(() => canonicalJson({ a: Number.NaN })).toThrow(TypeError);
  });

  it("computes SHA-256 as published", () => {
    // FIPS 180-2, appendix B.1: SHA-256("abc").
    expect(sha256Hex("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  });
});
