import { describe, expect, it } from "vitest";
import { healpixMapToFits } from "@/lib/analyses/fits";

// Rules from the FITS standard 4.0 (Pence et al. 2010, A&A 524, A42): sizes in 2880-byte
// blocks, 80-character ASCII cards, mandatory keywords in order, big-endian data.
function cards(bytes: Uint8Array, start: number): { cards: string[]; end: number } {
  const out: string[] = [];
  for (let o = start; ; o += 80) {
    const c = String.fromCharCode(...bytes.subarray(o, o + 80));
    out.push(c);
    if (c.startsWith("END ")) return { cards: out, end: Math.ceil((o + 80) / 2880) * 2880 };
  }
}
const value = (cs: string[], key: string) => {
  const c = cs.find((x) => x.startsWith(key.padEnd(8) + "="));
  if (!c) return undefined;
  const v = c.slice(10).split(" / ")[0]!.trim();
  return v.startsWith("'") ? v.slice(1, v.lastIndexOf("'")).trim() : v;
};

describe("HEALPix maps as FITS binary tables", () => {
  const nside = 4;
  const values = Float32Array.from({ length: 12 * nside * nside }, (_, i) => (i === 5 ? NaN : i * 0.5 - 3));
  const fits = healpixMapToFits(values, { nside, ordering: "RING", coordsys: "C", column: "significance", unit: "sigma" });

  it("is a whole number of 2880-byte blocks with an empty primary HDU", () => {
    expect(fits.length % 2880).toBe(0);
    const p = cards(fits, 0);
    expect(p.cards.slice(0, 4).map((c) => c.slice(0, 8).trim())).toEqual(["SIMPLE", "BITPIX", "NAXIS", "EXTEND"]);
    expect(value(p.cards, "NAXIS")).toBe("0");
    expect(p.end).toBe(2880);
  });

  it("has the mandatory binary-table keywords in order and the HEALPix keywords", () => {
    const e = cards(fits, 2880);
    expect(e.cards.slice(0, 8).map((c) => c.slice(0, 8).trim())).toEqual(["XTENSION", "BITPIX", "NAXIS", "NAXIS1", "NAXIS2", "PCOUNT", "GCOUNT", "TFIELDS"]);
    expect(value(e.cards, "XTENSION")).toBe("BINTABLE");
    expect(value(e.cards, "NAXIS2")).toBe(String(12 * nside * nside));
    expect(value(e.cards, "TFORM1")).toBe("E");
    expect(value(e.cards, "PIXTYPE")).toBe("HEALPIX");
    expect(value(e.cards, "ORDERING")).toBe("RING");
    expect(value(e.cards, "NSIDE")).toBe("4");
    expect(value(e.cards, "COORDSYS")).toBe("C");
    expect(value(e.cards, "LASTPIX")).toBe(String(12 * nside * nside - 1));
    for (const c of e.cards) expect(c).toMatch(/^[\x20-\x7e]{80}$/);
  });

  it("stores the values as big-endian 32-bit floats, NaN kept", () => {
    const e = cards(fits, 2880);
    const view = new DataView(fits.buffer, e.end);
    expect(view.getFloat32(0, false)).toBe(-3);
    expect(view.getFloat32(4 * 7, false)).toBe(0.5);
    expect(Number.isNaN(view.getFloat32(4 * 5, false))).toBe(true);
    expect(fits.length - e.end).toBe(Math.ceil((values.length * 4) / 2880) * 2880);
  });

  it("refuses a map whose length is not 12 Nside^2", () => {
    expect(() => healpixMapToFits(new Float32Array(10), { nside, ordering: "RING", coordsys: "C", column: "x", unit: "" })).toThrow(RangeError);
  });
});
