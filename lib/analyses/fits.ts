/**
 * A HEALPix map as a FITS file: an empty primary HDU and one binary-table extension with one
 * Float32 column, carrying the HEALPix keywords that sky-map tools read (PIXTYPE, ORDERING,
 * NSIDE, FIRSTPIX, LASTPIX, INDXSCHM, COORDSYS). Layout per the FITS standard 4.0 (Pence et
 * al. 2010, A&A 524, A42): 2880-byte blocks, 80-character header cards, big-endian IEEE-754
 * data (TFORM 'E' = 32-bit float), NaN for no data.
 */
const BLOCK = 2880;
const CARD = 80;

function card(key: string, value: string | number | boolean, comment = ""): string {
  const v = typeof value === "boolean" ? (value ? "T" : "F").padStart(20) : typeof value === "number" ? String(value).padStart(20) : `'${value.replace(/'/g, "''").padEnd(8)}'`.padEnd(20);
  const text = `${key.padEnd(8)}= ${v}${comment ? ` / ${comment}` : ""}`;
  return text.slice(0, CARD).padEnd(CARD);
}

function header(cards: string[]): Uint8Array {
  const text = [...cards, "END".padEnd(CARD)].join("");
  const size = Math.ceil(text.length / BLOCK) * BLOCK;
  const bytes = new Uint8Array(size).fill(0x20);
  for (let i = 0; i < text.length; i++) bytes[i] = text.charCodeAt(i) & 0x7f;
  return bytes;
}

export interface FitsMapOptions {
  nside: number;
  ordering: "RING" | "NESTED";
  /** HEALPix coordinate system letter: C (celestial, ICRS here), G (galactic), E (ecliptic). */
  coordsys: "C" | "G" | "E";
  column: string;
  unit: string;
  extname?: string;
}

export function healpixMapToFits(values: Float32Array, o: FitsMapOptions): Uint8Array {
  const npix = 12 * o.nside * o.nside;
  if (values.length !== npix) throw new RangeError(`a map at Nside ${o.nside} has ${npix} pixels, got ${values.length}`);
  const primary = header([card("SIMPLE", true, "conforms to FITS standard"), card("BITPIX", 8), card("NAXIS", 0), card("EXTEND", true)]);
  const ext = header([
    card("XTENSION", "BINTABLE", "binary table extension"),
    card("BITPIX", 8),
    card("NAXIS", 2),
    card("NAXIS1", 4, "bytes per row"),
    card("NAXIS2", npix, "rows: one per pixel"),
    card("PCOUNT", 0),
    card("GCOUNT", 1),
    card("TFIELDS", 1),
    card("TTYPE1", o.column.toUpperCase()),
    card("TFORM1", "E"),
    card("TUNIT1", o.unit),
    card("EXTNAME", o.extname ?? "SKYMAP"),
    card("PIXTYPE", "HEALPIX", "HEALPix pixelisation"),
    card("ORDERING", o.ordering),
    card("NSIDE", o.nside),
    card("FIRSTPIX", 0),
    card("LASTPIX", npix - 1),
    card("INDXSCHM", "IMPLICIT", "pixel index = row number"),
    card("OBJECT", "FULLSKY"),
    card("COORDSYS", o.coordsys, "C = celestial (ICRS)"),
  ]);
  const dataSize = Math.ceil((npix * 4) / BLOCK) * BLOCK;
  const out = new Uint8Array(primary.length + ext.length + dataSize);
  out.set(primary, 0);
  out.set(ext, primary.length);
  const view = new DataView(out.buffer, primary.length + ext.length, dataSize);
  for (let i = 0; i < npix; i++) view.setFloat32(4 * i, values[i]!, false);
  return out;
}
