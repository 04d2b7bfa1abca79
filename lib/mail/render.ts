/**
 * Alert e-mails: a plain-text part and an HTML part with the same content, and the small map
 * of each window attached inline (Content-ID), which mail clients show without fetching
 * anything. Every significance is given local AND post-trial, labelled, with the trials
 * counted, beside the caution that results are preliminary until reviewed.
 */
import { RESULT_CAUTION } from "@/lib/analyses/compute";
import type { AlertFigures } from "@/lib/alerts/figures";

/** An alert's figures with what the message also names: analysis, dataset, batch, threshold. */
export interface MailAlert extends AlertFigures {
  analysisName: string;
  datasetName: string;
  previousVersion: number | null;
  batchEvents: number | null;
  energyThresholdEeV: number | null;
  createdAt: Date;
}

export interface MailImage {
  png: Buffer;
  halfWidthDeg: number;
  maxSigma: number;
  sizePx: number;
}

export interface MailContext {
  baseUrl: string;
  recipientName: string;
  /** e.g. "4σ local" or "4σ local and 3σ post-trial" */
  thresholdText: string;
  unsubscribeUrl: string;
  unsubscribeExpires: Date;
}

export interface RenderedMail {
  subject: string;
  text: string;
  html: string;
  attachments: { filename: string; content: Buffer; contentType: string; cid: string; contentDisposition: "inline" }[];
}

const esc = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
const deg = (v: number, digits = 2) => `${v.toFixed(digits)}°`;
const signed = (v: number, digits = 2) => `${v >= 0 ? "+" : "−"}${Math.abs(v).toFixed(digits)}°`;
const sigma = (v: number) => `${v.toFixed(2)}σ`;

/** "p = 0.012 (12 of 1000 isotropic skies reached it; 2.26σ)" or "p < 0.001 (none of 1000 ...; above 3.09σ)". */
export function postTrialText(a: Pick<MailAlert, "postTrialP" | "postTrialPUpperBound" | "postTrialSigma" | "postTrialSigmaLowerBound" | "nSkies">): string {
  if (a.postTrialPUpperBound !== null) {
    return `p < ${a.postTrialPUpperBound} (none of ${a.nSkies} isotropic skies reached it; above ${a.postTrialSigmaLowerBound?.toFixed(2) ?? "?"}σ)`;
  }
  const reached = Math.round(a.postTrialP * a.nSkies);
  return `p = ${a.postTrialP} (${reached} of ${a.nSkies} isotropic skies reached it${a.postTrialSigma !== null ? `; ${a.postTrialSigma.toFixed(2)}σ` : ""})`;
}

export function imageCid(alertId: number): string {
  return `window-${alertId}@siderea`;
}

function summaryLine(a: MailAlert): string {
  const data = `version ${a.datasetVersion} of ${a.datasetName}${a.batchEvents ? ` (${a.batchEvents.toLocaleString("en-US")} new events)` : ""}`;
  const where = `within ${deg(a.radiusDeg, 0)} of right ascension ${deg(a.raDeg)}, declination ${signed(a.decDeg)}`;
  const counts = `${a.nOn} events were observed where ${a.nExpected.toFixed(1)} were expected`;
  if (a.kind === "update") {
    return `Update: the cluster announced at ${sigma(a.previousAnnouncedSigma ?? NaN)} local in "${a.analysisName}" rose further with ${data}: ${counts} ${where}, now ${sigma(a.localSigma)} local.`;
  }
  return `New data (${data}) lifted a cluster in the watched analysis "${a.analysisName}" above your threshold: ${counts} ${where}.`;
}

function figureRows(a: MailAlert): [string, string][] {
  return [
    ["Position (equatorial, ICRS)", `RA ${deg(a.raDeg)}, Dec ${signed(a.decDeg)}`],
    ["Position (galactic)", `l ${deg(a.lDeg)}, b ${signed(a.bDeg)}`],
    ["Window", `top-hat, radius ${deg(a.radiusDeg, 1)}${a.energyThresholdEeV !== null ? `, energies above ${a.energyThresholdEeV} EeV` : ""}`],
    ["N_on (observed)", String(a.nOn)],
    ["N_exp (expected)", a.nExpected.toFixed(2)],
    ["Local significance (pre-trial, Li & Ma eq. 17)", sigma(a.localSigma)],
    ["Post-trial (chance of a best window this strong in an isotropic sky)", postTrialText(a)],
    ["Trials counted", a.trialsCounted],
    ["Previous run", a.previousLocalSigma !== null ? `${sigma(a.previousLocalSigma)} local at this place on version ${a.previousVersion ?? "?"}` : `not among the top windows of version ${a.previousVersion ?? "?"}`],
  ];
}

function figuresHtml(a: MailAlert, image: MailImage | null): string {
  const rows = figureRows(a).map(([k, v]) => `<tr><th align="left" style="padding:2px 12px 2px 0;font-weight:normal;color:#475569">${esc(k)}</th><td style="padding:2px 0">${esc(v)}</td></tr>`).join("");
  const img = image
    ? `<p style="margin:12px 0 4px"><img src="cid:${imageCid(a.id)}" width="${image.sizePx}" height="${image.sizePx}" alt="Map of local significance around the window: ${esc(deg(image.halfWidthDeg, 0))} from the centre to each side, north up, east left; the black circle is the ${esc(deg(a.radiusDeg, 0))} window." style="border:1px solid #cbd5e1"></p>
<p style="margin:0;font-size:12px;color:#475569">Local significance, blue −${image.maxSigma}σ to red +${image.maxSigma}σ; grey: not seen by the array. North up, east left, ${deg(image.halfWidthDeg, 0)} to each side.</p>`
    : "";
  return `<table style="border-collapse:collapse;font-size:14px">${rows}</table>${img}`;
}

function cautionHtml(): string {
  return `<p style="margin:16px 0;padding:8px 12px;border:1px solid #fcd34d;background:#fffbeb;color:#78350f;font-size:13px"><strong>Preliminary.</strong> ${esc(RESULT_CAUTION)} A significance is not a discovery.</p>`;
}

function footer(ctx: MailContext, kind: "alert" | "digest"): { text: string; html: string } {
  const why = kind === "digest" ? "You receive this daily digest" : "You receive this e-mail";
  const until = ctx.unsubscribeExpires.toISOString().slice(0, 10);
  return {
    text: `${why} because you subscribed to alerts (threshold ${ctx.thresholdText}). Unsubscribe (no sign-in needed; the link works once, until ${until}): ${ctx.unsubscribeUrl}\nChange thresholds or pause: ${ctx.baseUrl}/alerts`,
    html: `<p style="font-size:12px;color:#64748b">${why} because you subscribed to alerts (threshold ${esc(ctx.thresholdText)}). <a href="${esc(ctx.unsubscribeUrl)}">Unsubscribe</a> (no sign-in needed; the link works once, until ${until}). <a href="${esc(ctx.baseUrl)}/alerts">Change thresholds or pause</a>.</p>`,
  };
}

function alertText(a: MailAlert, ctx: MailContext): string {
  const rows = figureRows(a).map(([k, v]) => `  ${k}: ${v}`).join("\n");
  return `${summaryLine(a)}\n\n${rows}\n\nThe analysis: ${ctx.baseUrl}/analyses/${a.runAnalysisId}\nAll alerts: ${ctx.baseUrl}/alerts\n`;
}

function alertHtmlBlock(a: MailAlert, ctx: MailContext, image: MailImage | null): string {
  return `<h2 style="font-size:16px;margin:16px 0 6px">${esc(a.kind === "update" ? "Update" : "New cluster")}: ${esc(a.analysisName)}, ${esc(sigma(a.localSigma))} local</h2>
<p style="margin:0 0 8px">${esc(summaryLine(a))}</p>
${figuresHtml(a, image)}
<p style="margin:10px 0"><a href="${esc(ctx.baseUrl)}/analyses/${a.runAnalysisId}">Open the analysis</a> · <a href="${esc(ctx.baseUrl)}/alerts">All alerts</a></p>`;
}

function wrapHtml(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${esc(title)}</title></head><body style="font-family:system-ui,-apple-system,Segoe UI,sans-serif;color:#0f172a;max-width:640px;margin:0 auto;padding:16px">${body}</body></html>`;
}

function attachment(a: MailAlert, image: MailImage | null): RenderedMail["attachments"] {
  return image ? [{ filename: `window-${a.id}.png`, content: image.png, contentType: "image/png", cid: imageCid(a.id), contentDisposition: "inline" }] : [];
}

/** One alert, one message. */
export function renderAlertMail(a: MailAlert, ctx: MailContext, image: MailImage | null): RenderedMail {
  const subject = `[Siderea] ${a.kind === "update" ? "Update" : "Alert"}: ${a.analysisName}, ${sigma(a.localSigma)} local at RA ${deg(a.raDeg, 1)}, Dec ${signed(a.decDeg, 1)} (preliminary)`;
  const foot = footer(ctx, "alert");
  const text = `Hello ${ctx.recipientName},\n\n${alertText(a, ctx)}\nPRELIMINARY: ${RESULT_CAUTION} A significance is not a discovery.\n\n${foot.text}\n`;
  const html = wrapHtml(subject, `<p>Hello ${esc(ctx.recipientName)},</p>${alertHtmlBlock(a, ctx, image)}${cautionHtml()}${foot.html}`);
  return { subject, text, html, attachments: attachment(a, image) };
}

/** The day's alerts of one subscriber, one message. */
export function renderDigestMail(alerts: { alert: MailAlert; image: MailImage | null }[], ctx: MailContext, day: Date): RenderedMail {
  const n = alerts.length;
  const subject = `[Siderea] Daily digest ${day.toISOString().slice(0, 10)}: ${n} alert${n === 1 ? "" : "s"} (preliminary)`;
  const foot = footer(ctx, "digest");
  const text = `Hello ${ctx.recipientName},\n\n${n} alert${n === 1 ? " was" : "s were"} raised on your subscriptions since the last digest.\n\n${alerts.map(({ alert }, i) => `${i + 1}. ${alertText(alert, ctx)}`).join("\n")}\nPRELIMINARY: ${RESULT_CAUTION} A significance is not a discovery.\n\n${foot.text}\n`;
  const html = wrapHtml(subject, `<p>Hello ${esc(ctx.recipientName)},</p><p>${n} alert${n === 1 ? " was" : "s were"} raised on your subscriptions since the last digest.</p>${alerts.map(({ alert, image }) => alertHtmlBlock(alert, ctx, image)).join("<hr>")}${cautionHtml()}${foot.html}`);
  return { subject, text, html, attachments: alerts.flatMap(({ alert, image }) => attachment(alert, image)) };
}
