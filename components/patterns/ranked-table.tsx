"use client";

import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  useReactTable,
  type SortingState,
} from "@tanstack/react-table";
import Link from "next/link";
import { buttonClass } from "@/components/ui/button";
import type { RankedCell } from "@/db/queries/cells";
import { formatBand, formatInterval, formatSig } from "@/lib/format";
import { ForestAxis, ForestBar } from "./forest-bar";
import { cellHref, type ExplorerParams } from "./query-strings";

export type RankedRow = RankedCell & { firstSeen: string | null };

const column = createColumnHelper<RankedRow>();

/** Recurring failures ranked on the server; sorting and paging ask the server again. */
export function RankedTable({
  rows,
  total,
  page,
  pageSize,
  sort,
  direction,
  unit,
  onSort,
  onPage,
  csvHref,
  isFetching,
  view,
}: {
  rows: RankedRow[];
  total: number;
  page: number;
  pageSize: number;
  sort: string;
  direction: "asc" | "desc";
  unit: "mi" | "km";
  onSort: (sort: string, direction: "asc" | "desc") => void;
  onPage: (page: number) => void;
  csvHref: string;
  isFetching: boolean;
  /** The explorer's period and vendor, carried into the drill-down. */
  view?: Pick<ExplorerParams, "from" | "to" | "vendor">;
}) {
  const columns = [
    column.accessor((r) => `${r.make} ${r.model} ${r.generation}`, {
      id: "cohort",
      header: "Cohort",
      enableSorting: false,
      cell: (i) => <Link href={cellHref(i.row.original, view)}>{i.getValue()}</Link>,
    }),
    column.accessor((r) => formatBand(r.bandFrom, r.bandTo, unit), {
      id: "band",
      header: "Mileage band",
      enableSorting: false,
    }),
    column.accessor((r) => r.dtc ?? r.component ?? "", {
      id: "fault",
      header: "Fault",
      enableSorting: false,
      cell: (i) => <span className="font-mono text-[13px]">{i.getValue()}</span>,
    }),
    column.accessor("events", {
      id: "events",
      header: "Events / exposure",
      cell: (i) => (
        <span className="tabular-nums">
          {i.row.original.events} in {formatSig(i.row.original.exposureMiles)} mi
        </span>
      ),
    }),
    column.accessor("rate", {
      id: "rate",
      header: "Per 10,000 mi (95%)",
      cell: (i) => (
        <span className="tabular-nums">
          {formatSig(i.row.original.rate)}{" "}
          <span className="text-ink-soft">
            ({formatInterval(i.row.original.rateLower, i.row.original.rateUpper)})
          </span>
        </span>
      ),
    }),
    column.accessor("ratioLower", {
      id: "ratioLower",
      header: "Rate ratio vs rest (95%)",
      cell: (i) => {
        const r = i.row.original;
        return (
          <div className="flex items-center gap-2">
            <ForestBar ratio={r.ratio} lower={r.ratioLower} upper={r.ratioUpper} />
            <span className="whitespace-nowrap tabular-nums">
              {r.ratio === null ? (r.events > 0 ? "∞" : "—") : formatSig(r.ratio)}{" "}
              <span className="text-ink-soft">({formatInterval(r.ratioLower, r.ratioUpper)})</span>
            </span>
          </div>
        );
      },
    }),
    column.accessor("signal", {
      id: "signal",
      header: "Signal",
      enableSorting: false,
      cell: (i) =>
        i.getValue() ? (
          <span className="rounded bg-ochre-100 px-1.5 py-0.5 text-xs font-semibold text-ochre-700">
            signal
          </span>
        ) : (
          <span className="text-xs text-ink-soft">q {formatSig(i.row.original.qValue, 2)}</span>
        ),
    }),
    column.accessor("firstSeen", {
      id: "firstSeen",
      header: "First seen",
      enableSorting: false,
      cell: (i) => <span className="whitespace-nowrap">{i.getValue()?.slice(0, 10) ?? "—"}</span>,
    }),
  ];
  const sorting: SortingState = [{ id: sort, desc: direction === "desc" }];
  // eslint-disable-next-line react-hooks/incompatible-library -- TanStack Table returns unmemoisable functions; this app does not use the React Compiler
  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting },
    manualSorting: true,
    manualPagination: true,
    rowCount: total,
    onSortingChange: (updater) => {
      const next = typeof updater === "function" ? updater(sorting) : updater;
      const first = next[0];
      if (first) onSort(first.id, first.desc ? "desc" : "asc");
    },
    getCoreRowModel: getCoreRowModel(),
  });
  const pages = Math.max(1, Math.ceil(total / pageSize));
  return (
    <div>
      <div
        className="overflow-x-auto rounded-lg border border-line bg-panel"
        aria-busy={isFetching}
      >
        <table className="w-full text-left text-sm">
          <caption className="sr-only">
            Recurring failures ranked by the lower bound of the rate ratio
          </caption>
          <thead className="border-b border-line bg-paper text-ink-soft">
            {table.getHeaderGroups().map((g) => (
              <tr key={g.id}>
                {g.headers.map((h) => {
                  const sorted = h.column.getIsSorted();
                  return (
                    <th
                      key={h.id}
                      scope="col"
                      className="px-3 py-2 font-medium"
                      aria-sort={
                        sorted ? (sorted === "desc" ? "descending" : "ascending") : undefined
                      }
                    >
                      {h.column.getCanSort() ? (
                        <button
                          type="button"
                          className="inline-flex items-center gap-1 hover:text-ink"
                          onClick={h.column.getToggleSortingHandler()}
                        >
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          <span aria-hidden="true">
                            {sorted === "desc" ? "↓" : sorted === "asc" ? "↑" : "↕"}
                          </span>
                        </button>
                      ) : (
                        flexRender(h.column.columnDef.header, h.getContext())
                      )}
                      {h.column.id === "ratioLower" ? <ForestAxis /> : null}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((r) => (
              <tr key={r.id} className="border-b border-line/60 last:border-0 hover:bg-sea-50">
                {r.getVisibleCells().map((c) => (
                  <td key={c.id} className="px-3 py-2 align-middle">
                    {flexRender(c.column.columnDef.cell, c.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {rows.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="px-3 py-6 text-center text-ink-soft">
                  No recurring failures match these filters.
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
      <div className="mt-3 flex flex-wrap items-center gap-3 text-sm">
        <button
          type="button"
          className={buttonClass.quiet}
          disabled={page <= 1}
          onClick={() => onPage(page - 1)}
        >
          ← Previous
        </button>
        <span className="text-ink-soft">
          Page {page} of {pages} · {total.toLocaleString("en-GB")} cells
        </span>
        <button
          type="button"
          className={buttonClass.quiet}
          disabled={page >= pages}
          onClick={() => onPage(page + 1)}
        >
          Next →
        </button>
        <a href={csvHref} className="ml-auto">
          Download CSV
        </a>
      </div>
    </div>
  );
}
