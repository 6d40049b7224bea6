/**
 * The method and exact figures behind a number shown in plain words, one click away: a native
 * disclosure (works without JavaScript, in print and on a tablet). Rows are label → value.
 */
export function FigureDetails({
  rows,
  summary = "How this is worked out",
  className = "",
}: {
  rows: readonly (readonly [label: string, value: React.ReactNode])[];
  summary?: string;
  className?: string;
}) {
  return (
    <details className={`mt-1 text-sm ${className}`} data-figure-details="">
      <summary className="cursor-pointer text-ink-soft underline decoration-dotted underline-offset-2">
        {summary}
      </summary>
      <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
        {rows.map(([label, value]) => (
          <div key={label} className="contents">
            <dt className="text-ink-soft">{label}</dt>
            <dd className="tabular-nums">{value}</dd>
          </div>
        ))}
      </dl>
    </details>
  );
}
