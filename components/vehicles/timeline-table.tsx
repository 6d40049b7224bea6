import { KIND_STYLE, KindMarker, type TimelineRecord } from "./timeline-kinds";

/**
 * The timeline's records as a table, newest first: what the chart shows, for the keyboard, for
 * screen readers and for print. Shows at most `limit` records and says so when there are more.
 */
export function TimelineTable({
  records,
  limit,
}: {
  /** Oldest first, as the chart takes them. */
  records: TimelineRecord[];
  limit: number;
}) {
  if (records.length === 0) {
    return <p className="text-sm text-ink-soft">No repairs, fault codes or fill-ups recorded.</p>;
  }
  const shown = records.slice(-limit).reverse();
  return (
    <>
      <p className="mb-2 text-sm text-ink-soft">
        Newest first; times are UTC.{" "}
        {shown.length < records.length
          ? `Showing the latest ${shown.length.toLocaleString("en-GB")} of ${records.length.toLocaleString("en-GB")} records.`
          : `${records.length.toLocaleString("en-GB")} record${records.length === 1 ? "" : "s"}.`}
      </p>
      {/* Focusable so that keyboard users can scroll it. */}
      <div
        role="region"
        aria-label="Timeline records, scrollable"
        tabIndex={0}
        className="max-h-[36rem] overflow-auto rounded-md border border-line"
      >
        <table className="w-full text-left text-sm" aria-label="Timeline records">
          <thead className="sticky top-0 bg-paper text-ink-soft">
            <tr>
              <th scope="col" className="px-3 py-2 font-medium">
                Kind
              </th>
              <th scope="col" className="px-3 py-2 font-medium">
                Date
              </th>
              <th scope="col" className="px-3 py-2 text-right font-medium">
                Odometer
              </th>
              <th scope="col" className="px-3 py-2 font-medium">
                Details
              </th>
            </tr>
          </thead>
          <tbody>
            {shown.map((r) => (
              <tr key={r.key} className="border-t border-line/60 align-top">
                <td className="px-3 py-1.5 whitespace-nowrap">
                  <span className="flex items-center gap-1.5">
                    <KindMarker kind={r.kind} /> {KIND_STYLE[r.kind].label}
                  </span>
                </td>
                <td className="px-3 py-1.5 whitespace-nowrap tabular-nums">{r.when}</td>
                <td className="px-3 py-1.5 text-right whitespace-nowrap tabular-nums">
                  {r.odometer}
                </td>
                <td className="min-w-64 px-3 py-1.5">
                  <span className="font-medium">{r.summary}</span>
                  {r.details.length > 0 ? (
                    <ul className="mt-0.5 space-y-0.5 text-[13px] text-ink-soft">
                      {r.details.map((d, i) => (
                        <li key={i}>{d}</li>
                      ))}
                    </ul>
                  ) : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </>
  );
}
