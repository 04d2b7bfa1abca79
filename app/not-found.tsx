import Link from "next/link";

export default function NotFound() {
  return (
    <main className="mx-auto flex min-h-screen max-w-lg flex-col justify-center gap-4 p-8">
      <p className="text-sm font-semibold uppercase tracking-wide text-dawn-600">404</p>
      <h1 className="text-2xl font-semibold">Nothing at this address</h1>
      <p className="text-slate-600">The page may have moved, or the link may be mistyped.</p>
      <Link href="/" className="text-night-700 underline underline-offset-4">
        Back to the dashboard
      </Link>
    </main>
  );
}
