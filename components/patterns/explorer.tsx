"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { Skeleton } from "@/components/ui/skeleton";
import type { HeatRow } from "@/db/queries/patterns";
import type { HeatMetric } from "@/lib/heat-colour";
import { fetchJson } from "@/components/ui/fetch-json";
import { RankedTable, type RankedRow } from "./ranked-table";
import { Filters, type PatternOptions } from "./filters";
import { Heatmap, METRIC_LABELS } from "./heatmap";
import { useExplorerParams } from "./params";
import {
  apiQuery,
  CELL_KEYS,
  cellHref,
  cellsQuery,
  heatmapQuery,
  PAGE_SIZE,
  type ExplorerParams,
} from "./query-strings";

type HeatmapData = { rows: HeatRow[]; bands: { band: number; from: number; to: number }[] };
type CellsData = { total: number; cells: RankedRow[] };

/** The pattern explorer: filters in the address, heatmap and ranked list fetched from route handlers. */
export function Explorer({
  options,
  unit,
  initial,
}: {
  options: PatternOptions;
  unit: "mi" | "km";
  initial: { heatmapQuery: string; heatmap: HeatmapData; cellsQuery: string; cells: CellsData };
}) {
  const router = useRouter();
  const [params, setParams] = useExplorerParams();
  const hq = heatmapQuery(params);
  const cq = cellsQuery(params);
  const heatmap = useQuery({
    queryKey: ["heatmap", hq],
    queryFn: () => fetchJson<HeatmapData>(`/api/heatmap?${hq}`),
    initialData: hq === initial.heatmapQuery ? initial.heatmap : undefined,
    placeholderData: keepPreviousData,
  });
  const cells = useQuery({
    queryKey: ["cells", cq],
    queryFn: () => fetchJson<CellsData>(`/api/cells?${cq}`),
    initialData: cq === initial.cellsQuery ? initial.cells : undefined,
    placeholderData: keepPreviousData,
  });
  const metric = params.metric as HeatMetric;
  const page = Math.max(1, Number(params.page ?? 1) || 1);
  const isFaultView =
    params.view === "faults" && Boolean(params.make && params.model && params.generation);
  const title = isFaultView
    ? `${params.make} ${params.model} ${params.generation}: faults × mileage bands (${METRIC_LABELS[metric]})`
    : `Cohorts × mileage bands, ${params.fault ? `fault ${params.fault}` : "all faults"} (${METRIC_LABELS[metric]})`;

  return (
    <div className="space-y-6">
      <Filters options={options} params={params} setParams={setParams} />
      <section
        aria-labelledby="heatmap-title"
        className="rounded-lg border border-line bg-panel p-5"
      >
        <div className="mb-3 flex flex-wrap items-center justify-between gap-3">
          <h2 id="heatmap-title" className="text-base">
            {title}
          </h2>
          <div className="flex flex-wrap items-center gap-3 text-sm">
            <label className="flex items-center gap-2">
              <span>Colour shows</span>
              <select
                className="rounded-md border border-line-strong bg-white px-2 py-1"
                value={metric}
                onChange={(e) => setParams({ metric: e.target.value as ExplorerParams["metric"] })}
              >
                <option value="rate">repairs per 10,000 mi</option>
                <option value="ratio">rate ratio vs the rest</option>
                <option value="share">share of vehicles affected</option>
              </select>
            </label>
            <label className="flex items-center gap-2">
              <span>Rows</span>
              <select
                className="rounded-md border border-line-strong bg-white px-2 py-1"
                value={isFaultView ? "faults" : "cohorts"}
                onChange={(e) => setParams({ view: e.target.value as ExplorerParams["view"] })}
              >
                <option value="cohorts">cohorts</option>
                <option
                  value="faults"
                  disabled={!params.make || !params.model || !params.generation}
                >
                  faults of the chosen cohort
                </option>
              </select>
            </label>
          </div>
        </div>
        {heatmap.error ? (
          <p role="alert" className="text-alarm-700">
            {heatmap.error.message}
          </p>
        ) : heatmap.isPending ? (
          <Skeleton className="h-72" />
        ) : (
          <Heatmap
            rows={heatmap.data.rows}
            bands={heatmap.data.bands}
            metric={metric}
            unit={unit}
            title={title}
            onOpenCell={(row, cell) => {
              const fault =
                row.faultKey === "all"
                  ? params.fault
                  : row.faultKey.replace(/^dtc:|^component:/, "");
              if (!fault) {
                // An all-faults cell: show that cohort's faults instead.
                setParams({
                  view: "faults",
                  make: row.make,
                  model: row.model,
                  generation: row.generation,
                });
                return;
              }
              router.push(
                cellHref(
                  {
                    make: row.make,
                    model: row.model,
                    generation: row.generation,
                    bandFrom: cell.bandFrom,
                    bandTo: cell.bandTo,
                    dtc: /^[PCBU][0-3]/i.test(fault) ? fault : null,
                    component: /^[PCBU][0-3]/i.test(fault) ? null : fault,
                  },
                  params,
                ),
              );
            }}
          />
        )}
      </section>
      <section aria-labelledby="ranked-title">
        <h2 id="ranked-title" className="mb-1 text-lg">
          Recurring failures, ranked
        </h2>
        <p className="mb-3 text-sm text-ink-soft">
          Ranked by the lower end of the rate ratio&apos;s 95% interval against the rest of the
          fleet in the same band, so that one repair on a rare cohort cannot top the list. Bars: the
          ratio and its interval on a log scale; the dashed line is 1 (no difference).
        </p>
        {cells.error ? (
          <p role="alert" className="text-alarm-700">
            {cells.error.message}
          </p>
        ) : cells.isPending ? (
          <Skeleton className="h-96" />
        ) : (
          <RankedTable
            rows={cells.data.cells}
            total={cells.data.total}
            page={page}
            pageSize={PAGE_SIZE}
            sort={params.sort ?? "ratioLower"}
            direction={
              (params.direction as "asc" | "desc") ?? (params.sort === "qValue" ? "asc" : "desc")
            }
            unit={unit}
            isFetching={cells.isFetching}
            view={params}
            onSort={(sort, direction) => setParams({ sort, direction })}
            onPage={(p) => setParams({ page: String(p) })}
            csvHref={`/api/cells?${apiQuery(params, CELL_KEYS, { format: "csv" })}`}
          />
        )}
      </section>
    </div>
  );
}
