"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { Skeleton } from "@/components/ui/skeleton";
import type { HeatRow } from "@/db/queries/patterns";
import {
  CHOOSABLE_METRICS,
  metricFor,
  type ChoosableMetric,
  type DistanceUnit,
  type MetricContext,
} from "@/lib/metrics";
import { intervalLabel } from "@/lib/plain-words";
import { fetchJson } from "@/components/ui/fetch-json";
import { RankedTable, type RankedRow } from "./ranked-table";
import { Filters, type PatternOptions } from "./filters";
import { Heatmap } from "./heatmap";
import { KindSwitch } from "./kind-switch";
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

/** The run the figures come from: its confidence names the intervals. */
type Run = { confidenceLevel: number } | null;
type HeatmapData = {
  rows: HeatRow[];
  bands: { band: number; from: number; to: number }[];
  run?: Run;
};
type CellsData = { total: number; cells: RankedRow[]; run?: Run };

/** The pattern explorer: filters in the address, heatmap and ranked list fetched from route handlers. */
export function Explorer({
  options,
  unit,
  confidence,
  initial,
}: {
  options: PatternOptions;
  unit: DistanceUnit;
  /** The confidence the latest run's intervals were computed at. */
  confidence: number;
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
  const kind = params.kind ?? "failure";
  const isWear = kind === "wear";
  // The intervals are named by the run they come from (a recompute may have changed the level).
  const ctx: MetricContext = {
    unit,
    confidence:
      heatmap.data?.run?.confidenceLevel ?? cells.data?.run?.confidenceLevel ?? confidence,
  };
  const metric = metricFor(params.metric, kind);
  const page = Math.max(1, Number(params.page ?? 1) || 1);
  const isFaultView =
    params.view === "faults" && Boolean(params.make && params.model && params.generation);
  const faultLabel = params.fault
    ? (options.faults.find((f) => f.value === params.fault)?.label ??
      options.faults.find((f) => f.value.startsWith(`${params.fault}/`))?.system ??
      params.fault)
    : isWear
      ? "all wear"
      : "all failures";
  const title =
    (isWear ? "Wear: " : "") +
    (isFaultView
      ? `${params.make} ${params.model} ${params.generation}: ${isWear ? "wear" : "faults"} × mileage bands (${metric.label(unit)})`
      : `cohorts × mileage bands, ${faultLabel} (${metric.label(unit)})`);
  const heading = title.charAt(0).toUpperCase() + title.slice(1);

  return (
    <div className="space-y-6">
      <KindSwitch params={params} setParams={setParams} />
      <Filters options={options} params={params} setParams={setParams} />
      <section
        aria-labelledby="heatmap-title"
        className="rounded-lg border border-line bg-panel p-5"
      >
        <div className="mb-3 flex flex-wrap items-center justify-between gap-3">
          <h2 id="heatmap-title" className="text-base">
            {heading}
          </h2>
          <div className="flex flex-wrap items-center gap-3 text-sm">
            <label className="flex items-center gap-2">
              <span>Colour shows</span>
              <select
                className="rounded-md border border-line-strong bg-white px-2 py-1"
                value={params.metric}
                onChange={(e) => setParams({ metric: e.target.value as ChoosableMetric })}
              >
                {CHOOSABLE_METRICS.map((key) => (
                  <option key={key} value={key}>
                    {metricFor(key, kind).label(unit).toLowerCase()}
                  </option>
                ))}
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
                  {isWear ? "wear" : "faults"} of the chosen cohort
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
            ctx={ctx}
            title={heading}
            onOpenCell={(row, cell) => {
              const fault =
                row.faultKey === "all" || row.faultKey === "all:wear"
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
                    bandFrom: cell.bandFromMi,
                    bandTo: cell.bandToMi,
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
          {isWear ? "Early wear, ranked" : "Recurring failures, ranked"}
        </h2>
        <p className="mb-3 text-sm text-ink-soft">
          {isWear
            ? "Parts that wear out sooner on a cohort than on the rest of the fleet in the same band. "
            : ""}
          Ranked by the lower end of the {intervalLabel(ctx.confidence)} of times the rest of the
          fleet in the same band, so that one repair on a rare cohort cannot top the list. Bars:
          that figure and its interval on a log scale; the dashed line is 1 (no difference).
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
            ctx={ctx}
            kind={kind}
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
