"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useMemo, useState } from "react";
import { buttonClass, inputClass } from "@/components/ui/button";
import { Skeleton } from "@/components/ui/skeleton";
import type { DateOrder } from "@/lib/import/date-order";
import { ApiError, fetchJson } from "./api";
import { DateOrderNotice, DateOrderQuestion } from "./date-order";

type DateFormat = "iso" | "mdy" | "dmy";
type ReadOptions = {
  dateFormat: DateFormat;
  decimalSeparator: "." | ",";
  distanceUnit: "mi" | "km";
  volumeUnit: "l" | "us-gal" | "imp-gal";
};
type Column = { key: string; label: string; isRequired: boolean };
type PreviewRow =
  | { rowNumber: number; ok: true; values: Record<string, unknown>; warnings: string[] }
  | { rowNumber: number; ok: false; issues: string[] };
type Preview = {
  inspection: {
    headers: string[];
    mapping: Record<string, number | null>;
    read: ReadOptions;
    dateOrder: DateOrder;
    readNotes: string[];
    problems: string[];
    notices: string[];
  };
  columns: Column[];
  rows: PreviewRow[];
};

const READ_CHOICES: { key: keyof ReadOptions; label: string; options: [string, string][] }[] = [
  {
    key: "dateFormat",
    label: "Dates are written",
    options: [
      ["iso", "year-month-day"],
      ["mdy", "month/day/year"],
      ["dmy", "day.month.year or day/month/year"],
    ],
  },
  {
    key: "decimalSeparator",
    label: "Decimal separator",
    options: [
      [".", "point (12.5)"],
      [",", "comma (12,5)"],
    ],
  },
  {
    key: "distanceUnit",
    label: "Odometer unit",
    options: [
      ["mi", "miles"],
      ["km", "kilometres"],
    ],
  },
  {
    key: "volumeUnit",
    label: "Fuel volume unit",
    options: [
      ["l", "litres"],
      ["us-gal", "US gallons"],
      ["imp-gal", "imperial gallons"],
    ],
  },
];

/** How the file's own dates read when the user has not chosen ("" while it is theirs to choose). */
function fileDateFormat(order: DateOrder, placeholder: DateFormat): DateFormat | "" {
  if (order.status === "decided") return order.format;
  if (order.status === "iso") return "iso";
  return order.status === "ask" ? "" : placeholder;
}

function show(v: unknown): string {
  if (v === null || v === undefined) return "";
  if (Array.isArray(v)) return v.join(" ");
  if (typeof v === "number") return v.toLocaleString("en-GB", { maximumFractionDigits: 2 });
  return String(v);
}

/** Step 2 of an import: check which column is which, how values are written, and start. */
export function MappingStep({ importId }: { importId: number; kind: string }) {
  const initial = useQuery({
    queryKey: ["preview", importId],
    queryFn: () => fetchJson<Preview>(`/api/imports/${importId}/preview`),
  });
  if (initial.error) {
    return (
      <p role="alert" className="text-alarm-700">
        {initial.error.message}
      </p>
    );
  }
  if (initial.isPending) return <Skeleton className="h-64" />;
  return <MappingEditor importId={importId} initial={initial.data} />;
}

function MappingEditor({ importId, initial }: { importId: number; initial: Preview }) {
  const queryClient = useQueryClient();
  const { inspection, columns } = initial;
  const [mapping, setMapping] = useState<Record<string, string | null>>(() =>
    Object.fromEntries(
      Object.entries(inspection.mapping).map(([k, at]) => [
        k,
        at === null ? null : (inspection.headers[at] ?? null),
      ]),
    ),
  );
  const [read, setRead] = useState<ReadOptions>(inspection.read);
  // The date order the user chose; until then the server reads the file's own, and refuses to
  // start a file whose dates fit both orders.
  const [dateChoice, setDateChoice] = useState<DateFormat | null>(null);
  const choice = useMemo(
    () => ({ mapping, read: { ...read, dateFormat: dateChoice ?? undefined } }),
    [mapping, read, dateChoice],
  );
  const live = useQuery({
    queryKey: ["preview-live", importId, choice],
    queryFn: () =>
      fetchJson<{ problems: string[]; rows: PreviewRow[]; dateOrder: DateOrder }>(
        `/api/imports/${importId}/preview`,
        { method: "POST", body: JSON.stringify(choice) },
      ),
    placeholderData: (prev) => prev,
  });
  // Learnt again from the columns mapped on screen.
  const dateOrder = live.data?.dateOrder ?? inspection.dateOrder;
  const isDateOrderOpen = dateOrder.status === "ask" && dateChoice === null;
  // The first note is the date order's (detectReadOptions): said in its own block when the file
  // decides or the user must.
  const readNotes =
    dateOrder.status === "decided" || dateOrder.status === "ask"
      ? inspection.readNotes.slice(1)
      : inspection.readNotes;
  const start = useMutation({
    mutationFn: () =>
      fetchJson(`/api/imports/${importId}/start`, { method: "POST", body: JSON.stringify(choice) }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ["import", importId] }),
  });
  const fileProblems = inspection.problems.filter((p) => !/column|required|mapped/i.test(p));
  const problems = live.data?.problems ?? [];
  const rows = live.data?.rows ?? initial.rows;
  const fields = rows.find((r): r is Extract<PreviewRow, { ok: true }> => r.ok)?.values ?? {};
  const startProblems =
    start.error instanceof ApiError
      ? ((start.error.body as { problems?: string[] })?.problems ?? [])
      : [];

  return (
    <div className="space-y-6">
      {fileProblems.length ? (
        <div role="alert" className="rounded-md bg-alarm-100 px-4 py-3 text-sm text-alarm-700">
          <p className="font-semibold">This file cannot be imported as it is.</p>
          <ul className="mt-1 list-disc pl-5">
            {fileProblems.map((p) => (
              <li key={p}>{p}</li>
            ))}
          </ul>
        </div>
      ) : null}
      {inspection.notices.map((n) => (
        <p key={n} role="note" className="rounded-md bg-ochre-100 px-4 py-2 text-sm">
          {n}
        </p>
      ))}
      <section
        aria-labelledby="mapping-title"
        className="rounded-lg border border-line bg-panel p-5"
      >
        <h2 id="mapping-title" className="text-base">
          Columns
        </h2>
        <p className="mt-1 text-sm text-ink-soft">
          Recurra matched the file&apos;s headers to its own columns. Fix any that are wrong; the
          choice is remembered for the next file of this kind. Required columns are marked *; a
          vehicle needs a VIN or a unit number.
        </p>
        <div className="mt-4 grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {columns.map((c) => (
            <label key={c.key} className="block text-sm">
              <span className="mb-1 block font-medium">
                {c.label}
                {c.isRequired ? " *" : ""}
              </span>
              <select
                className={inputClass}
                value={mapping[c.key] ?? ""}
                onChange={(e) =>
                  setMapping({ ...mapping, [c.key]: e.target.value === "" ? null : e.target.value })
                }
              >
                <option value="">— not in this file —</option>
                {inspection.headers.map((h) => (
                  <option key={h} value={h}>
                    {h}
                  </option>
                ))}
              </select>
            </label>
          ))}
        </div>
      </section>
      <section
        aria-labelledby="reading-title"
        className="rounded-lg border border-line bg-panel p-5"
      >
        <h2 id="reading-title" className="text-base">
          How values are written
        </h2>
        <ul className="mt-1 list-disc pl-5 text-sm text-ink-soft">
          {readNotes.map((n) => (
            <li key={n}>{n}</li>
          ))}
        </ul>
        <div className="mt-4 grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
          {READ_CHOICES.map((rc) => (
            <label key={rc.key} className="block text-sm">
              <span className="mb-1 block font-medium">{rc.label}</span>
              <select
                className={inputClass}
                value={
                  rc.key === "dateFormat"
                    ? (dateChoice ?? fileDateFormat(dateOrder, read.dateFormat))
                    : read[rc.key]
                }
                onChange={(e) =>
                  rc.key === "dateFormat"
                    ? setDateChoice(e.target.value as DateFormat)
                    : setRead({ ...read, [rc.key]: e.target.value } as ReadOptions)
                }
              >
                {rc.key === "dateFormat" && isDateOrderOpen ? (
                  <option value="" disabled>
                    — choose below —
                  </option>
                ) : null}
                {rc.options.map(([value, label]) => (
                  <option key={value} value={value}>
                    {label}
                  </option>
                ))}
              </select>
            </label>
          ))}
        </div>
      </section>
      <DateOrderNotice order={dateOrder} />
      <DateOrderQuestion
        order={dateOrder}
        chosen={dateChoice === "dmy" || dateChoice === "mdy" ? dateChoice : null}
        onChoose={setDateChoice}
      />
      <section
        aria-labelledby="preview-title"
        className="rounded-lg border border-line bg-panel p-5"
      >
        <h2 id="preview-title" className="text-base">
          First rows, as they will be read
        </h2>
        {problems.length ? (
          <ul role="alert" className="mt-2 list-disc pl-5 text-sm text-alarm-700">
            {problems.map((p) => (
              <li key={p}>{p}</li>
            ))}
          </ul>
        ) : (
          <div className="mt-3 overflow-x-auto">
            <table className="w-full text-left text-xs">
              <thead className="text-ink-soft">
                <tr>
                  <th className="py-1 pr-3 font-medium">Row</th>
                  {Object.keys(fields).map((f) => (
                    <th key={f} className="whitespace-nowrap py-1 pr-3 font-medium">
                      {f.replace(/([A-Z])/g, " $1").toLowerCase()}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {rows.map((r) => (
                  <tr
                    key={r.rowNumber}
                    className={`border-t border-line/60 align-top ${r.ok ? "" : "bg-alarm-100/50"}`}
                  >
                    <td className="py-1 pr-3 tabular-nums">{r.rowNumber}</td>
                    {r.ok ? (
                      Object.keys(fields).map((f) => (
                        <td
                          key={f}
                          className="max-w-48 truncate py-1 pr-3"
                          title={show(r.values[f])}
                        >
                          {show(r.values[f])}
                        </td>
                      ))
                    ) : (
                      <td
                        colSpan={Math.max(1, Object.keys(fields).length)}
                        className="py-1 pr-3 text-alarm-700"
                      >
                        Will be rejected: {r.issues.join(" ")}
                      </td>
                    )}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>
      <div className="flex flex-wrap items-center gap-3">
        <button
          type="button"
          className={buttonClass.primary}
          disabled={
            fileProblems.length > 0 || problems.length > 0 || isDateOrderOpen || start.isPending
          }
          onClick={() => start.mutate()}
        >
          {start.isPending ? "Starting…" : "Start import"}
        </button>
        {isDateOrderOpen ? (
          <p className="text-sm text-ink-soft">Choose which way round the dates are first.</p>
        ) : null}
        {start.error ? (
          <p role="alert" className="text-sm text-alarm-700">
            {start.error.message} {startProblems.join(" ")}
          </p>
        ) : null}
      </div>
    </div>
  );
}
