/** Marks a wear cell wherever it appears (wear is a pattern only when it comes early). */
export function KindBadge({ kind, className = "" }: { kind: string; className?: string }) {
  if (kind !== "wear") return null;
  return (
    <span
      className={`rounded bg-sea-50 px-1.5 py-0.5 text-xs font-semibold text-sea-800 ${className}`}
      data-testid="wear-badge"
      title="Wear: a part that wears out in normal use, a pattern only when it wears out sooner than on the rest of the fleet"
    >
      Wear
    </span>
  );
}
