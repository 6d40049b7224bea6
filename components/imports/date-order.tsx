"use client";

import type { DateOrder, DateReading } from "@/lib/import/date-order";

type DayOrMonthFirst = "dmy" | "mdy";

const ORDER_WORDS: Record<DayOrMonthFirst, string> = {
  dmy: "day/month/year",
  mdy: "month/day/year",
};

/**
 * When the file itself decides how its dates are read (a day above 12), says so, naming the
 * column and the date that decides. Shown above the preview.
 */
export function DateOrderNotice({ order }: { order: DateOrder }) {
  if (order.status !== "decided") return null;
  const { sample, format } = order;
  return (
    <div
      role="note"
      aria-label="How dates are read"
      className="rounded-md border border-sea-600 bg-sea-50 px-4 py-3 text-sm"
    >
      <p className="font-semibold">Dates are read {ORDER_WORDS[format]}.</p>
      <p className="mt-1">
        “{sample.column}” has {sample.value}, which can only be{" "}
        {format === "dmy" ? sample.dayFirst : sample.monthFirst}.
      </p>
    </div>
  );
}

function readingText(r: DateReading): string {
  return `${r.value} → ${r.dayFirst ?? "not a date"} or ${r.monthFirst ?? "not a date"}`;
}

/**
 * When both orders read the file's dates (or its dates disagree), asks which it is, with
 * sample dates read both ways. The import cannot start until one is chosen.
 */
export function DateOrderQuestion({
  order,
  chosen,
  onChoose,
}: {
  order: DateOrder;
  chosen: DayOrMonthFirst | null;
  onChoose: (format: DayOrMonthFirst) => void;
}) {
  if (order.status !== "ask") return null;
  const [first] = order.samples;
  return (
    <fieldset className="rounded-md border-2 border-ochre-500 bg-ochre-100 px-4 py-3 text-sm">
      <legend className="px-1 font-semibold">Which way round are the dates?</legend>
      <p>
        {order.isConflict
          ? "The dates in this file disagree: some can only be day/month/year, others only month/day/year. Choose how to read them; rows that do not fit are rejected."
          : "Every date in the first rows fits both day/month/year and month/day/year. Choose how to read them before starting."}{" "}
        {chosen ? null : "Until you do, the preview reads them month/day/year."}
      </p>
      <ul aria-label="Sample dates from the file" className="mt-2 space-y-0.5">
        {order.samples.map((s) => (
          <li key={`${s.column}\u0001${s.value}`}>
            <span className="text-ink-soft">{s.column}:</span> {readingText(s)}
          </li>
        ))}
      </ul>
      <div className="mt-3 flex flex-wrap gap-3">
        {(["dmy", "mdy"] as const).map((format) => (
          <label
            key={format}
            className="flex cursor-pointer items-center gap-1.5 rounded-md border border-line-strong bg-panel px-3 py-1.5 has-[:checked]:border-sea-700 has-[:checked]:bg-sea-50 has-[:checked]:font-medium"
          >
            <input
              type="radio"
              name="date-order"
              value={format}
              checked={chosen === format}
              onChange={() => onChoose(format)}
              className="accent-sea-700"
            />
            {format === "dmy" ? "Day first" : "Month first"} ({ORDER_WORDS[format]}
            {first
              ? `: ${first.value} is ${(format === "dmy" ? first.dayFirst : first.monthFirst) ?? "not a date"}`
              : ""}
            )
          </label>
        ))}
      </div>
    </fieldset>
  );
}
