import { describe, expect, it } from "vitest";
import { ifNoneMatchMatches, notModified, strongEtag } from "./conditional";

describe("If-None-Match (RFC 9110)", () => {
  it("matches by the weak comparison of section 8.8.3.2", () => {
    // The section's table (from memory of the RFC): W/"1" vs W/"1" and W/"1" vs "1" match weakly, "1" vs "1" too;
    // W/"1" vs W/"2" never.
    expect(ifNoneMatchMatches('W/"1"', 'W/"1"')).toBe(true);
    expect(ifNoneMatchMatches('W/"1"', 'W/"2"')).toBe(false);
    expect(ifNoneMatchMatches('W/"1"', '"1"')).toBe(true);
    expect(ifNoneMatchMatches('"1"', '"1"')).toBe(true);
    expect(ifNoneMatchMatches('"1"', 'W/"1"')).toBe(true);
  });

  it("reads the header forms of section 13.1.2's examples", () => {
    const tag = '"xyzzy"';
    expect(ifNoneMatchMatches('"xyzzy"', tag)).toBe(true);
    expect(ifNoneMatchMatches('W/"xyzzy"', tag)).toBe(true);
    expect(ifNoneMatchMatches('"xyzzy", "r2d2xxxx", "c3piozzzz"', tag)).toBe(true);
    expect(ifNoneMatchMatches('W/"r2d2xxxx", W/"xyzzy", W/"c3piozzzz"', tag)).toBe(true);
    expect(ifNoneMatchMatches('"r2d2xxxx", "c3piozzzz"', tag)).toBe(false);
    // "*" matches any current representation.
    expect(ifNoneMatchMatches("*", tag)).toBe(true);
  });

  it("never matches an absent, empty or unquoted header, nor a tag that only contains ours", () => {
    const tag = '"abc"';
    expect(ifNoneMatchMatches(null, tag)).toBe(false);
    expect(ifNoneMatchMatches("", tag)).toBe(false);
    expect(ifNoneMatchMatches("abc", tag)).toBe(false);
    expect(ifNoneMatchMatches('"xabcx"', tag)).toBe(false);
    expect(ifNoneMatchMatches('"abc', tag)).toBe(false);
  });

  it("makes strong tags only of entity-tag characters (etagc: no quote, no space, no control)", () => {
    expect(strongEtag("a1-_b")).toBe('"a1-_b"');
    expect(() => strongEtag('a"b')).toThrow();
    expect(() => strongEtag("a b")).toThrow();
    expect(() => strongEtag("")).toThrow();
  });

  it("answers 304 with no body and only the headers section 15.4.5 asks to repeat", async () => {
    const from = new Headers({ "Cache-Control": "public, no-cache", Vary: "Cookie", "Content-Type": "text/html", "Content-Security-Policy": "default-src 'self'", "Content-Length": "99" });
    const res = notModified('"v1"', from);
    expect(res.status).toBe(304);
    expect(await res.text()).toBe("");
    expect(res.headers.get("ETag")).toBe('"v1"');
    expect(res.headers.get("Cache-Control")).toBe("public, no-cache");
    expect(res.headers.get("Vary")).toBe("Cookie");
    expect(res.headers.get("Content-Type")).toBeNull();
    expect(res.headers.get("Content-Security-Policy")).toBeNull();
  });
});
