/**
 * A small reader of Internet messages (RFC 5322 headers, MIME RFC 2045-2047 multiparts,
 * base64 and quoted-printable bodies, encoded-word headers) for the admin inbox of the local
 * SMTP sink. It reads what mail libraries write (tested against nodemailer's composer); it is
 * not a general-purpose parser and never runs on untrusted input outside development.
 */

export interface MimePart {
  headers: Map<string, string[]>;
  contentType: string;
  params: Record<string, string>;
  body: Buffer;
  children: MimePart[];
}

export interface ParsedMessage {
  subject: string;
  from: string;
  to: string;
  date: string | null;
  text: string | null;
  html: string | null;
  attachments: { contentType: string; filename: string | null; contentId: string | null; size: number; content: Buffer }[];
}

function splitHead(raw: Buffer): { head: string; body: Buffer } {
  const s = raw.toString("latin1");
  const m = /\r?\n\r?\n/.exec(s);
  if (!m) return { head: s, body: Buffer.alloc(0) };
  return { head: s.slice(0, m.index), body: raw.subarray(m.index + m[0].length) };
}

function parseHeaders(head: string): Map<string, string[]> {
  const map = new Map<string, string[]>();
  const unfolded = head.replace(/\r?\n[ \t]+/g, " ");
  for (const line of unfolded.split(/\r?\n/)) {
    const i = line.indexOf(":");
    if (i <= 0) continue;
    const key = line.slice(0, i).trim().toLowerCase();
    const value = line.slice(i + 1).trim();
    map.set(key, [...(map.get(key) ?? []), value]);
  }
  return map;
}

function decodeCharset(bytes: Buffer, charset: string | undefined): string {
  try {
    return new TextDecoder((charset ?? "utf-8").toLowerCase()).decode(bytes);
  } catch {
    return new TextDecoder("utf-8").decode(bytes);
  }
}

/** Quoted-printable (RFC 2045 section 6.7): soft line breaks removed, =XX decoded. */
export function decodeQuotedPrintable(text: string): Buffer {
  const s = text.replace(/=\r?\n/g, "");
  const out: number[] = [];
  for (let i = 0; i < s.length; i++) {
    const c = s[i]!;
    if (c === "=" && /^[0-9A-Fa-f]{2}$/.test(s.slice(i + 1, i + 3))) {
      out.push(parseInt(s.slice(i + 1, i + 3), 16));
      i += 2;
    } else out.push(s.charCodeAt(i) & 0xff);
  }
  return Buffer.from(out);
}

/** Encoded words in headers (RFC 2047): =?charset?B|Q?text?=, adjacent words joined. */
export function decodeEncodedWords(value: string): string {
  return value
    .replace(/(=\?[^?]+\?[bBqQ]\?[^?]*\?=)\s+(?==\?[^?]+\?[bBqQ]\?[^?]*\?=)/g, "$1")
    .replace(/=\?([^?]+)\?([bBqQ])\?([^?]*)\?=/g, (_, charset: string, enc: string, text: string) => {
      const bytes = enc.toUpperCase() === "B" ? Buffer.from(text, "base64") : decodeQuotedPrintable(text.replace(/_/g, " "));
      return decodeCharset(bytes, charset.replace(/\*.*$/, ""));
    });
}

function parseContentType(value: string | undefined): { type: string; params: Record<string, string> } {
  const v = value ?? "text/plain; charset=us-ascii";
  const [type, ...rest] = v.split(";");
  const params: Record<string, string> = {};
  const re = /([^=;\s]+)\s*=\s*("(?:[^"\\]|\\.)*"|[^;]*)/g;
  for (let m = re.exec(rest.join(";")); m; m = re.exec(rest.join(";"))) {
    let val = m[2]!.trim();
    if (val.startsWith('"')) val = val.slice(1, -1).replace(/\\(.)/g, "$1");
    params[m[1]!.toLowerCase()] = val;
  }
  return { type: type!.trim().toLowerCase(), params };
}

function decodeBody(body: Buffer, encoding: string | undefined): Buffer {
  const e = (encoding ?? "7bit").toLowerCase();
  if (e === "base64") return Buffer.from(body.toString("latin1").replace(/[^A-Za-z0-9+/=]/g, ""), "base64");
  if (e === "quoted-printable") return decodeQuotedPrintable(body.toString("latin1"));
  return body;
}

export function parsePart(raw: Buffer): MimePart {
  const { head, body } = splitHead(raw);
  const headers = parseHeaders(head);
  const { type, params } = parseContentType(headers.get("content-type")?.[0]);
  if (type.startsWith("multipart/") && params.boundary) {
    const text = body.toString("latin1");
    const delimiter = `--${params.boundary}`;
    const children: MimePart[] = [];
    const lines = text.split(/\r?\n/);
    let current: string[] | null = null;
    for (const line of lines) {
      if (line === `${delimiter}--` || line.trimEnd() === `${delimiter}--`) {
        if (current) children.push(parsePart(Buffer.from(current.join("\r\n"), "latin1")));
        current = null;
        break;
      }
      if (line === delimiter || line.trimEnd() === delimiter) {
        if (current) children.push(parsePart(Buffer.from(current.join("\r\n"), "latin1")));
        current = [];
      } else if (current) current.push(line);
    }
    return { headers, contentType: type, params, body: Buffer.alloc(0), children };
  }
  return { headers, contentType: type, params, body: decodeBody(body, headers.get("content-transfer-encoding")?.[0]), children: [] };
}

function leaves(p: MimePart): MimePart[] {
  return p.children.length ? p.children.flatMap(leaves) : [p];
}

export function parseMessage(raw: Buffer): ParsedMessage {
  const root = parsePart(raw);
  const h = (k: string) => decodeEncodedWords(root.headers.get(k)?.[0] ?? "");
  let text: string | null = null;
  let html: string | null = null;
  const attachments: ParsedMessage["attachments"] = [];
  for (const leaf of leaves(root)) {
    const disposition = parseContentType(leaf.headers.get("content-disposition")?.[0] ?? "inline");
    const isAttachment = disposition.type === "attachment" || Boolean(leaf.headers.get("content-id")) || !leaf.contentType.startsWith("text/");
    if (!isAttachment && leaf.contentType === "text/plain" && text === null) text = decodeCharset(leaf.body, leaf.params.charset);
    else if (!isAttachment && leaf.contentType === "text/html" && html === null) html = decodeCharset(leaf.body, leaf.params.charset);
    else {
      const cid = leaf.headers.get("content-id")?.[0]?.replace(/^<|>$/g, "") ?? null;
      attachments.push({ contentType: leaf.contentType, filename: disposition.params.filename ?? leaf.params.name ?? null, contentId: cid, size: leaf.body.length, content: leaf.body });
    }
  }
  return { subject: h("subject"), from: h("from"), to: h("to"), date: root.headers.get("date")?.[0] ?? null, text, html, attachments };
}

/** The HTML with `cid:` references replaced by data: URLs of the attached parts, for display in a sandboxed frame. */
export function inlineCidImages(html: string, attachments: ParsedMessage["attachments"]): string {
  return html.replace(/cid:([^"'\s>]+)/g, (whole, cid: string) => {
    const a = attachments.find((x) => x.contentId === cid);
    return a ? `data:${a.contentType};base64,${a.content.toString("base64")}` : whole;
  });
}
