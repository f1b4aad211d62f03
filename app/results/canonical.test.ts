import { describe, expect, it } from "vitest";
import { canonicalJson, legacyCanonicalJson, payloadHash, sha256Hex } from "./canonical";

/*
 * RFC 8785, JSON Canonicalization Scheme (JCS), June 2020. The examples below are the RFC's own:
 * the object of §3.2.2 / §3.2.4 (its canonical form and UTF-8 bytes), the property-sorting example of §3.2.3,
 * and number samples of Appendix B (IEEE 754 bit patterns and their serialization). The Appendix B rows are
 * recalled from memory; one recalled row (a negative value near -3.3e-6) decoded to another number and was left out.
 */
describe("RFC 8785 canonical JSON (the canonicalize package)", () => {
  it("§3.2.2/§3.2.4: the example object canonicalizes to the RFC's output, byte for byte", () => {
    const input = String.raw`{
      "numbers": [333333333.33333329, 1E30, 4.50, 2e-3, 0.000000000000000000000000001],
      "string": "\u20ac$\u000F\u000aA'\u0042\u0022\u005c\\\"\/",
      "literals": [null, true, false]
    }`;
    const out = canonicalJson(JSON.parse(input));
    expect(out).toBe(String.raw`{"literals":[null,true,false],"numbers":[333333333.3333333,1e+30,4.5,0.002,1e-27],"string":"€$\u000f\nA'B\"\\\\\"/"}`);
    // §3.2.4, UTF-8 generation: the same output as the RFC prints it in hex
    const hex =
      "7b 22 6c 69 74 65 72 61 6c 73 22 3a 5b 6e 75 6c 6c 2c 74 72 75 65 2c 66 61 6c 73 65 5d 2c 22 6e " +
      "75 6d 62 65 72 73 22 3a 5b 33 33 33 33 33 33 33 33 33 2e 33 33 33 33 33 33 33 2c 31 65 2b 33 30 " +
      "2c 34 2e 35 2c 30 2e 30 30 32 2c 31 65 2d 32 37 5d 2c 22 73 74 72 69 6e 67 22 3a 22 e2 82 ac 24 " +
      "5c 75 30 30 30 66 5c 6e 41 27 42 5c 22 5c 5c 5c 5c 5c 22 2f 22 7d";
    expect(Buffer.from(out, "utf8").toString("hex").match(/../g)!.join(" ")).toBe(hex);
  });

  it("§3.2.3: properties are sorted by their UTF-16 code units, not by code point or UTF-8", () => {
    const input = { "\u20ac": "Euro Sign", "\r": "Carriage Return", "\ufb33": "Hebrew Letter Dalet With Dagesh", "1": "One", "\ud83d\ude00": "Emoji: Grinning Face", "\u0080": "Control", "\u00f6": "Latin Small Letter O With Diaeresis" };
    // the RFC's order: CR, "1", U+0080, U+00F6, U+20AC, U+1F600 (surrogates D83D DE00), U+FB33; only CR is escaped.
    // (Read as a string: Object.keys of a parsed object would put the integer-like "1" first.)
    expect(canonicalJson(input)).toBe(
      '{"\\r":"Carriage Return","1":"One","\u0080":"Control","\u00f6":"Latin Small Letter O With Diaeresis","\u20ac":"Euro Sign","\ud83d\ude00":"Emoji: Grinning Face","\ufb33":"Hebrew Letter Dalet With Dagesh"}',
    );
  });

  it("Appendix B: numbers serialize as ECMAScript's shortest round trip", () => {
    const samples: [string, string][] = [
      ["0000000000000000", "0"],
      ["8000000000000000", "0"], // minus zero
      ["0000000000000001", "5e-324"],
      ["8000000000000001", "-5e-324"],
      ["7fefffffffffffff", "1.7976931348623157e+308"],
      ["ffefffffffffffff", "-1.7976931348623157e+308"],
      ["4340000000000000", "9007199254740992"],
      ["c340000000000000", "-9007199254740992"],
      ["4430000000000000", "295147905179352830000"],
      ["44b52d02c7e14af5", "9.999999999999997e+22"],
      ["44b52d02c7e14af6", "1e+23"],
      ["44b52d02c7e14af7", "1.0000000000000001e+23"],
      ["444b1ae4d6e2ef4e", "999999999999999700000"],
      ["444b1ae4d6e2ef4f", "999999999999999900000"],
      ["444b1ae4d6e2ef50", "1e+21"],
      ["3eb0c6f7a0b5ed8c", "9.999999999999997e-7"],
      ["3eb0c6f7a0b5ed8d", "0.000001"],
      ["41b3de4355555553", "333333333.3333332"],
      ["41b3de4355555554", "333333333.33333325"],
      ["41b3de4355555555", "333333333.3333333"],
      ["41b3de4355555556", "333333333.3333334"],
      ["41b3de4355555557", "333333333.33333343"],
      ["43143ff3c1cb0959", "1424953923781206.2"],
    ];
    const view = new DataView(new ArrayBuffer(8));
    for (const [bits, expected] of samples) {
      view.setBigUint64(0, BigInt(`0x${bits}`));
      expect(canonicalJson(view.getFloat64(0)), bits).toBe(expected);
    }
    // Appendix B: NaN and Infinity have no JSON form and are errors
    expect(() => canonicalJson(Number.NaN)).toThrow();
    expect(() => canonicalJson([Number.POSITIVE_INFINITY])).toThrow();
  });

  it("hashes equal objects alike whatever their key order", () => {
    expect(payloadHash({ x: 1, y: [1, 2] })).toBe(payloadHash({ y: [1, 2], x: 1 }));
    expect(payloadHash({ x: 1 })).not.toBe(payloadHash({ x: 2 }));
  });

  it("computes SHA-256 as published", () => {
    // FIPS 180-2, appendix B.1: SHA-256("abc").
    expect(sha256Hex("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  });
});

describe("the earlier scheme gatecrash-json/1, kept for versions published under it", () => {
  it("still makes the form it always made: sorted keys, undefined members dropped", () => {
    expect(legacyCanonicalJson({ b: 1, a: { d: [3, { z: 1, y: 2 }], c: undefined } })).toBe('{"a":{"d":[3,{"y":2,"z":1}]},"b":1}');
    expect(() => legacyCanonicalJson({ a: Number.NaN })).toThrow(TypeError);
  });
  it("hashes by the scheme it is asked for", () => {
    const payload = { version: 1, standings: [{ place: 1, title: "Entry A", mixed: 0.6551724137931034 }] };
    expect(payloadHash(payload, "gatecrash-json/1")).toBe(sha256Hex(legacyCanonicalJson(payload)));
    expect(payloadHash(payload, "rfc8785-sha256")).toBe(sha256Hex(canonicalJson(payload)));
    // A lone surrogate has a JSON.stringify form but no RFC 8785 one (I-JSON, RFC 7493 §2.1): the schemes differ there.
    expect(() => payloadHash({ t: "\ud800" }, "rfc8785-sha256")).toThrow();
    expect(payloadHash({ t: "\ud800" }, "gatecrash-json/1")).toBe(sha256Hex('{"t":"\\ud800"}'));
  });
});
