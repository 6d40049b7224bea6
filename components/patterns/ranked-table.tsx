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
import { FigureDetails } from "@/components/ui/figure-details";
import { cellOfRanked, type RankedCell } from "@/lib/cell-types";
import { formatBand } from "@/lib/format";
import {
  cellDetails,
  metricFigure,
  metricFor,
  metricHeader,
  RATIO,
  type MetricContext,
} from "@/lib/metrics";
import { formatPlain } from "@/lib/plain-words";
import { milesToUnit } from "@/lib/units";
import { ForestAxis, ForestBar } from "./forest-bar";
import { KindBadge } from "@/components/ui/kind-badge";
import { cellHref, type ExplorerParams } from "./query-strings";

export type RankedRow = RankedCell & { firstSeen: string | null };

const column = createColumnHelper<RankedRow>();

/** A figure of the table: the value, and its interval in words. */
function Figure({ value, likely }: { value: string; likely: string }) {
  return (
    <span className="tabular-nums">
      {value} <span className="block text-xs text-ink-soft">{likely}</span>
    </span>
  );
}

/** Recurring failures (or early wear) ranked on the server; sorting and paging ask the server again. */
export function RankedTable({
  rows,
  total,
  page,
  pageSize,
  sort,
  direction,
  ctx,
  kind,
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
  /** The organisation's unit and the confidence of the cells' run. */
  ctx: MetricContext;
  kind: "failure" | "wear";
  onSort: (sort: string, direction: "asc" | "desc") => void;
  onPage: (page: number) => void;
  csvHref: string;
  isFetching: boolean;
  /** The explorer's period and vendor, carried into the drill-down. */
  view?: Pick<ExplorerParams, "from" | "to" | "vendor">;
}) {
  const unit = ctx.unit;
  const rate = metricFor("rate", kind);
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
      cell: (i) => <span className="whitespace-nowrap">{i.getValue()}</span>,
    }),
    column.accessor("faultName", {
      id: "fault",
      header: "Fault",
      enableSorting: false,
      cell: (i) => (
        <span className="block min-w-40">
          {i.getValue()} <KindBadge kind={i.row.original.kind} />
        </span>
      ),
    }),
    column.accessor("events", {
      id: "events",
      header: "Repairs, and distance driven",
      cell: (i) => (
        <span className="tabular-nums">
          {i.row.original.events} in {formatPlain(milesToUnit(i.row.original.exposureMiles, unit))}{" "}
          {unit}
        </span>
      ),
    }),
    column.accessor("rate", {
      id: "rate",
      header: metricHeader(rate, ctx),
      cell: (i) => <Figure {...metricFigure(rate, cellOfRanked(i.row.original), unit)} />,
    }),
    column.accessor("ratioLower", {
      id: "ratioLower",
      header: metricHeader(RATIO, ctx),
      cell: (i) => {
        const r = i.row.original;
        return (
          <div className="flex items-center gap-2">
            <ForestBar ratio={r.ratio} lower={r.ratioLower} upper={r.ratioUpper} />
            <Figure {...metricFigure(RATIO, cellOfRanked(r), unit)} />
          </div>
        );
      },
    }),
    column.accessor("signal", {
      id: "signal",
      header: "Signal, and how it is worked out",
      enableSorting: false,
      cell: (i) => (
        <div className="min-w-32">
          {i.getValue() ? (
            <span className="rounded bg-ochre-100 px-1.5 py-0.5 text-xs font-semibold text-ochre-700">
              signal
            </span>
          ) : (
            <span className="text-xs text-ink-soft">not a signal</span>
          )}
          <FigureDetails
            summary="Details"
            className="text-xs"
            rows={cellDetails(cellOfRanked(i.row.original), ctx)}
          />
        </div>
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
            {kind === "wear" ? "Early wear" : "Recurring failures"} ranked by the lower end of the
            interval of times the rest of the fleet
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
                  {kind === "wear" ? "No early wear" : "No recurring failures"} match these filters.
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
