import { describe, expect, it } from "vitest";
import { canonicalJson, compareSummaries, sha256Hex } from "@/lib/analyses/canonical";

describe("canonical settings and their hash", () => {
  it("writes the same text whatever the key order, and drops undefined fields", () => {
    expect(canonicalJson({ b: 1, a: [3, { d: null, c: "x" }], e: undefined })).toBe('{"a":[3,{"c":"x","d":null}],"b":1}');
    expect(canonicalJson({ a: 1, b: 2 })).toBe(canonicalJson({ b: 2, a: 1 }));
  });

  it("hashes with SHA-256 (FIPS 180-4 test vector 'abc')", () => {
    expect(sha256Hex("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  });

  it("refuses NaN and infinities, which JSON cannot carry", () => {
    expect(() => canonicalJson({ a: NaN })).toThrow(RangeError);
  });

  it("finds differing numbers beyond the relative tolerance and names their paths", () => {
    expect(compareSummaries({ a: 1, b: { c: 2 } }, { a: 1 + 1e-12, b: { c: 2 } })).toEqual([]);
    expect(compareSummaries({ a: 1, b: { c: 2 } }, { a: 1, b: { c: 2.1 } })).toEqual([{ path: "b.c", saved: 2, rerun: 2.1 }]);
    expect(compareSummaries({ a: "x" }, { a: "y" })).toHaveLength(1);
  });
});
