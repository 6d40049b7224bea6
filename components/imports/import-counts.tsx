import type { ImportSummary } from "./api";

const n = (v: number) => v.toLocaleString("en-GB");

/** Rows read, imported, duplicates, warnings and rejected, side by side. */
export function ImportCounts({ summary }: { summary: ImportSummary }) {
  const items: [string, number, string][] = [
    ["Rows read", summary.rowsTotal, "rows"],
    ["Imported", summary.rowsImported, "imported"],
    ["Duplicates skipped", summary.rowsDuplicate, "duplicates"],
    ["With warnings", summary.rowsWarning, "warnings"],
    ["Rejected", summary.rowsRejected, "rejected"],
  ];
  return (
    <dl className="grid grid-cols-2 gap-3 sm:grid-cols-3 lg:grid-cols-5">
      {items.map(([label, value, id]) => (
        <div key={id} className="rounded-lg border border-line bg-panel p-3">
          <dt className="text-sm text-ink-soft">{label}</dt>
          <dd className="text-2xl font-semibold tabular-nums" data-testid={`count-${id}`}>
            {n(value)}
          </dd>
        </div>
      ))}
    </dl>
  );
}
