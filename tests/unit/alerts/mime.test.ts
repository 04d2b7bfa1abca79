import MailComposer from "nodemailer/lib/mail-composer";
import { describe, expect, it } from "vitest";
import { decodeEncodedWords, decodeQuotedPrintable, inlineCidImages, parseMessage } from "@/lib/mail/mime";

async function compose(options: ConstructorParameters<typeof MailComposer>[0]): Promise<Buffer> {
  return new Promise((resolve, reject) => new MailComposer(options).compile().build((err, msg) => (err ? reject(err) : resolve(msg))));
}

describe("reading received messages for the admin inbox", () => {
  it("reads what nodemailer's composer writes: encoded subject, text, HTML and an inline image by Content-ID", async () => {
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 1, 2, 3, 255, 0]);
    const html = `<p>Local 5.20σ — post-trial p &lt; 0.001</p><img src="cid:window-1@siderea">${"<b>long line</b>".repeat(30)}`;
    const raw = await compose({
      from: "Siderea alerts <alerts@siderea.localhost>",
      to: "Member Müller <member@demo.siderea.test>",
      subject: "[Siderea] Alert: Scan “Süd”, 5.20σ local at Dec −39.5° (preliminary)",
      text: "Déjà vu: N_on 199, N_exp 62.36 — σ\nsecond line",
      html,
      attachments: [{ filename: "window-1.png", content: png, contentType: "image/png", cid: "window-1@siderea" }],
    });
    const m = parseMessage(raw);
    expect(m.subject).toBe("[Siderea] Alert: Scan “Süd”, 5.20σ local at Dec −39.5° (preliminary)");
    expect(m.from).toBe("Siderea alerts <alerts@siderea.localhost>");
    expect(m.to).toBe("Member Müller <member@demo.siderea.test>");
    expect(m.text!.replace(/\r\n/g, "\n")).toBe("Déjà vu: N_on 199, N_exp 62.36 — σ\nsecond line");
    expect(m.html).toBe(html);
    expect(m.attachments).toHaveLength(1);
    expect(m.attachments[0]).toMatchObject({ contentType: "image/png", contentId: "window-1@siderea", filename: "window-1.png", size: png.length });
    expect(m.attachments[0]!.content.equals(png)).toBe(true);
    expect(inlineCidImages(m.html!, m.attachments)).toContain(`src="data:image/png;base64,${png.toString("base64")}"`);
  });

  it("decodes quoted-printable (RFC 2045 6.7) and encoded words (RFC 2047) from their published examples", () => {
    // RFC 2045 section 6.7: soft line break "=" at the end of a line; "=3D" is "=".
    expect(decodeQuotedPrintable("a=3Db soft=\r\nbreak").toString()).toBe("a=b softbreak");
    // RFC 2047 section 8 examples.
    expect(decodeEncodedWords("=?ISO-8859-1?Q?Keld_J=F8rn_Simonsen?=")).toBe("Keld Jørn Simonsen");
    expect(decodeEncodedWords("=?ISO-8859-1?B?SWYgeW91IGNhbiByZWFkIHRoaXMgeW8=?= =?ISO-8859-2?B?dSB1bmRlcnN0YW5kIHRoZSBleGFtcGxlLg==?=")).toBe("If you can read this you understand the example.");
    expect(decodeEncodedWords("(=?ISO-8859-1?Q?a?= =?ISO-8859-1?Q?b?=)")).toBe("(ab)");
  });
});
