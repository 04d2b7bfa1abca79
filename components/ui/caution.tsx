/** The standing caution shown beside every significance and in every alert. */
export const PRELIMINARY_CAUTION =
  "Significances shown here are preliminary until reviewed under the collaboration's own rules. A local significance is not a discovery: read it beside the post-trial figure and the trials counted.";

export function Caution({ className = "" }: { className?: string }) {
  return (
    <p role="note" className={`rounded-md border border-amber-300 bg-amber-50 px-4 py-3 text-sm text-amber-900 ${className}`}>
      <strong className="font-semibold">Preliminary. </strong>
      {PRELIMINARY_CAUTION}
    </p>
  );
}
