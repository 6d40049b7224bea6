import { CHOOSABLE_METRICS, type ChoosableMetric } from "@/lib/metrics";

/** Query strings of the explorer's API calls; shared by the server page (prefetch) and the client. */
export type ExplorerParams = {
  view: "cohorts" | "faults";
  metric: ChoosableMetric;
  /** "wear": the wear cells (wearing out sooner than on the rest of the fleet); absent: failures. */
  kind?: "wear";
  fault?: string;
  make?: string;
  model?: string;
  generation?: string;
  bandFrom?: string;
  bandTo?: string;
  /** Repairs opened from / to (ISO dates) and by one vendor: a filtered view. */
  from?: string;
  to?: string;
  vendor?: string;
  signals?: string;
  sort?: string;
  direction?: string;
  page?: string;
};

/** The filters every view shares. */
const FILTER_KEYS = [
  "kind",
  "fault",
  "make",
  "model",
  "generation",
  "bandFrom",
  "bandTo",
  "from",
  "to",
  "vendor",
] as const;

export const EXPLORER_KEYS = [
  "view",
  "metric",
  ...FILTER_KEYS,
  "signals",
  "sort",
  "direction",
  "page",
] as const;

const HEATMAP_KEYS = ["view", ...FILTER_KEYS] as const;
export const CELL_KEYS = [...FILTER_KEYS, "signals", "sort", "direction"] as const;
export const PAGE_SIZE = 25;

/** Query string for an API call from the explorer's state (only the keys the API knows). */
export function apiQuery(
  params: ExplorerParams,
  keys: readonly (keyof ExplorerParams)[],
  extra: Record<string, string> = {},
): string {
  const q = new URLSearchParams();
  for (const k of keys) {
    const v = params[k];
    if (v) q.set(k, v);
  }
  for (const [k, v] of Object.entries(extra)) q.set(k, v);
  return q.toString();
}

export function heatmapQuery(p: ExplorerParams): string {
  return apiQuery(p, HEATMAP_KEYS);
}

export function cellsQuery(p: ExplorerParams): string {
  const page = Math.max(1, Number(p.page ?? 1) || 1);
  return apiQuery(p, CELL_KEYS, {
    limit: String(PAGE_SIZE),
    offset: String((page - 1) * PAGE_SIZE),
  });
}

/** Explorer state from raw search parameters. */
export function explorerParams(raw: Record<string, string | undefined>): ExplorerParams {
  const out: Record<string, string> = {};
  for (const k of EXPLORER_KEYS) {
    const v = raw[k];
    if (v) out[k] = v;
  }
  return {
    ...out,
    view: out.view === "faults" ? "faults" : "cohorts",
    metric: CHOOSABLE_METRICS.find((m) => m === out.metric) ?? "rate",
    kind: out.kind === "wear" ? "wear" : undefined,
  } as ExplorerParams;
}

/** A period or vendor view as query-string pairs (the keys that are set), to carry into a link. */
export function viewParams(
  view: Pick<ExplorerParams, "from" | "to" | "vendor">,
): Record<string, string> {
  const out: Record<string, string> = {};
  for (const k of ["from", "to", "vendor"] as const) {
    const v = view[k];
    if (v) out[k] = v;
  }
  return out;
}

/** Address of a cell's drill-down page; a period or vendor view carries on into it. */
export function cellHref(
  c: {
    make: string;
    model: string;
    generation: string;
    bandFrom: number;
    bandTo: number;
    dtc: string | null;
    component: string | null;
  },
  view: Pick<ExplorerParams, "from" | "to" | "vendor"> = {},
): string {
  const width = c.bandTo - c.bandFrom;
  const q = new URLSearchParams({
    make: c.make,
    model: c.model,
    generation: c.generation,
    band: String(Math.round(c.bandFrom / width)),
    fault: c.dtc ?? c.component ?? "",
    ...viewParams(view),
  });
  return `/patterns/cell?${q.toString()}`;
}
