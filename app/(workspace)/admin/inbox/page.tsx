import type { Metadata } from "next";
import Link from "next/link";
import { requirePageUser } from "@/lib/auth/server";
import { inboxEnabled, listInbox, readInboxMessage } from "@/lib/services/mail-inbox";
import { Card } from "@/components/ui/card";
import { Forbidden } from "@/components/ui/forbidden";
import { PageHeader } from "@/components/ui/page-header";

export const metadata: Metadata = { title: "Mail inbox" };
export const dynamic = "force-dynamic";

/** The local SMTP sink's inbox: administrators only, and only where SIDEREA_MAIL_INBOX=on (development, demos, tests). */
export default async function InboxPage({ searchParams }: { searchParams: Promise<{ id?: string }> }) {
  const { user, forbidden } = await requirePageUser("users:manage");
  if (forbidden) return <Forbidden role={user.role} what="The mail inbox" />;
  if (!inboxEnabled()) {
    return (
      <>
        <PageHeader title="Mail inbox" />
        <Card><p className="text-slate-700" data-testid="inbox-off">The inbox of the local SMTP sink is off here (SIDEREA_MAIL_INBOX is not “on”): mail goes to the configured SMTP relay.</p></Card>
      </>
    );
  }
  const messages = listInbox();
  const { id } = await searchParams;
  const selected = readInboxMessage(id ?? messages[0]?.id ?? "");
  return (
    <>
      <PageHeader title="Mail inbox" lead="What the local SMTP sink received (development and demos only; a real relay is configured with SIDEREA_SMTP_URL). Newest first." />
      <div className="grid gap-4 lg:grid-cols-[22rem_minmax(0,1fr)]">
        <Card title={`Messages (${messages.length})`}>
          {messages.length === 0 ? <p className="text-slate-600" data-testid="inbox-empty">No message received yet.</p> : (
            <ul className="divide-y divide-slate-100 text-sm" data-testid="inbox-list">
              {messages.map((m) => (
                <li key={m.id}>
                  <Link href={`/admin/inbox?id=${m.id}`} aria-current={selected?.id === m.id ? "true" : undefined} className={`block px-2 py-2 hover:bg-mist-100 ${selected?.id === m.id ? "bg-mist-100" : ""}`}>
                    <span className="block font-medium text-slate-900">{m.subject || "(no subject)"}</span>
                    <span className="block text-slate-600">to {m.to.join(", ")}</span>
                    <time className="block text-xs text-slate-500" dateTime={m.receivedAt}>{m.receivedAt.replace("T", " ").slice(0, 19)} UTC</time>
                  </Link>
                </li>
              ))}
            </ul>
          )}
        </Card>
        {selected ? (
          <Card title="Message">
            <dl className="grid grid-cols-[8rem_1fr] gap-y-1 text-sm" data-testid="inbox-message">
              <dt className="text-slate-500">Subject</dt><dd className="font-medium" data-testid="inbox-subject">{selected.subject}</dd>
              <dt className="text-slate-500">From</dt><dd>{selected.from} <span className="text-slate-500">(envelope {selected.envelopeFrom ?? "—"})</span></dd>
              <dt className="text-slate-500">To</dt><dd data-testid="inbox-to">{selected.envelopeTo.join(", ")}</dd>
              <dt className="text-slate-500">Received</dt><dd>{selected.receivedAt.replace("T", " ").slice(0, 19)} UTC</dd>
              <dt className="text-slate-500">Parts</dt><dd>{[selected.text ? "text" : null, selected.html ? "HTML" : null, ...selected.attachments.map((a) => `${a.contentType}${a.contentId ? ` (inline ${a.contentId})` : ""}, ${a.size} bytes`)].filter(Boolean).join("; ")}</dd>
            </dl>
            {selected.html ? (
              <>
                <h3 className="mt-4 text-sm font-semibold">HTML (sandboxed: no scripts, no links followed)</h3>
                <iframe title="HTML part of the message" sandbox="" srcDoc={selected.html} className="mt-1 h-[36rem] w-full rounded border border-slate-200 bg-white" data-testid="inbox-html" />
              </>
            ) : null}
            {selected.text ? (
              <>
                <h3 className="mt-4 text-sm font-semibold">Plain text</h3>
                <pre className="mt-1 max-h-96 overflow-auto whitespace-pre-wrap break-all rounded border border-slate-200 bg-slate-50 p-3 text-xs" data-testid="inbox-text">{selected.text}</pre>
              </>
            ) : null}
          </Card>
        ) : null}
      </div>
    </>
  );
}
