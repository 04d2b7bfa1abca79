import Link from "next/link";

export default function WorkspaceNotFound() {
  return (
    <div>
      <h1 className="text-xl font-semibold">Not found</h1>
      <p className="mt-1 text-slate-600">There is no such record, or it was removed.</p>
      <Link href="/" className="mt-3 inline-block underline underline-offset-4">
        Back to the dashboard
      </Link>
    </div>
  );
}
