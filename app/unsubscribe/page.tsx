import type { Metadata } from "next";
import { inspectUnsubscribeLink } from "@/lib/services/subscriptions";
import { UnsubscribeButton } from "@/components/alerts/unsubscribe-button";

export const metadata: Metadata = { title: "Unsubscribe" };
export const dynamic = "force-dynamic";

const MESSAGES = {
  used: "This unsubscribe link has already been used: the subscription was removed then.",
  expired: "This unsubscribe link has expired. Sign in and remove the subscription on the Alerts page.",
  invalid: "This link is not a valid unsubscribe link (it may be incomplete: copy the whole link from the e-mail).",
  gone: "This subscription no longer exists.",
} as const;

/**
 * The page of the unsubscribe link in alert e-mails: no sign-in. Opening it changes nothing
 * (mail scanners open links); the button does, once.
 */
export default async function UnsubscribePage({ searchParams }: { searchParams: Promise<{ token?: string }> }) {
  const { token } = await searchParams;
  const state = token ? await inspectUnsubscribeLink(token) : ({ state: "invalid" } as const);
  return (
    <main id="main" className="mx-auto max-w-xl px-4 py-16">
      <p className="text-lg font-semibold">Siderea<span className="text-dawn-500">.</span></p>
      <h1 className="mt-6 text-2xl font-semibold text-slate-900">Unsubscribe from alerts</h1>
      {state.state === "valid" ? (
        <div className="mt-4 space-y-4">
          <p className="text-slate-700">Stop receiving {state.what} by e-mail? No sign-in is needed; the link works once.</p>
          <UnsubscribeButton token={token!} />
        </div>
      ) : (
        <p role="alert" className="mt-4 rounded-md border border-slate-200 bg-slate-50 p-4 text-slate-800" data-testid="unsubscribe-state">{MESSAGES[state.state]}</p>
      )}
    </main>
  );
}
