export default function Loading() {
  return (
    <div role="status" aria-live="polite" className="flex items-center gap-3 text-slate-600">
      <span className="h-4 w-4 animate-spin rounded-full border-2 border-night-700 border-t-transparent" aria-hidden />
      Loading…
    </div>
  );
}
