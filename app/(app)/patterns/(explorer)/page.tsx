import type { Metadata } from "next";
import { Explorer } from "@/components/patterns/explorer";
import {
  cellsQuery,
  explorerParams,
  heatmapQuery,
  PAGE_SIZE,
} from "@/components/patterns/query-strings";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { ensureCellView } from "@/db/queries/cell-views";
import { getLatestRun, listRankedCells } from "@/db/queries/cells";
import { getHeatmap, getPatternOptions } from "@/db/queries/patterns";
import { requirePage } from "@/lib/auth/guard";
import { CellQuery, HeatmapQuery } from "@/lib/cell-request";
import { formatBand } from "@/lib/format";
import { intervalLabel } from "@/lib/plain-words";
import { queryValues, type PageSearchParams } from "@/lib/search-params";

export const metadata: Metadata = { title: "Patterns" };

export default async function PatternsPage({ searchParams }: { searchParams: PageSearchParams }) {
  const auth = await requirePage("patterns:read");
  const raw = await queryValues(searchParams, { dropEmpty: true });
  const params = explorerParams(raw);
  const db = await getDb();
  const unit = auth.organisation.distanceUnit;
  const run = await getLatestRun(db, auth);
  if (!run) {
    return (
      <>
        <PageHeader
          title="Patterns"
          description="Where failures concentrate by cohort and mileage, and how sure we are."
        />
        <Panel>
          <p className="text-ink-soft">
            No statistics yet: they are computed after the first import of repair orders (or with{" "}
            <code className="font-mono">
              npm run recurra -- recompute --org {auth.organisation.slug}
            </code>
            ).
          </p>
        </Panel>
      </>
    );
  }
  // Server prefetch of the first view, so the page shows data without a second round trip.
  const hq = HeatmapQuery.safeParse(params);
  const page = Math.max(1, Number(params.page ?? 1) || 1);
  const cq = CellQuery.safeParse({ ...params, limit: PAGE_SIZE, offset: (page - 1) * PAGE_SIZE });
  // A period or a vendor: the cells of that view (computed from the raw rows on first use).
  const viewId = cq.success
    ? await ensureCellView(db, auth, { from: cq.data.from, to: cq.data.to, vendor: cq.data.vendor })
    : null;
  const [options, heatmap, ranked] = await Promise.all([
    getPatternOptions(db, auth),
    getHeatmap(db, auth, {
      view: hq.success ? hq.data.view : "cohorts",
      fault: hq.data?.fault,
      make: hq.data?.make,
      model: hq.data?.model,
      generation: hq.data?.generation,
      bandFromMi: hq.data?.bandFrom,
      bandToMi: hq.data?.bandTo,
      kind: hq.data?.kind,
      viewId,
    }),
    listRankedCells(db, auth, {
      fault: cq.data?.fault,
      make: cq.data?.make,
      model: cq.data?.model,
      generation: cq.data?.generation,
      bandFromMi: cq.data?.bandFrom,
      bandToMi: cq.data?.bandTo,
      isSignalOnly: cq.data?.signals,
      kind: cq.data?.kind,
      sort: cq.data?.sort,
      direction: cq.data?.direction,
      withFirstSeen: true,
      viewId,
      limit: PAGE_SIZE,
      offset: (page - 1) * PAGE_SIZE,
    }),
  ]);
  const maxBand = Math.max(0, ...heatmap.bands.map((b) => b.band), 12);
  const bands = Array.from({ length: maxBand + 1 }, (_, i) => ({
    from: i * run.bandWidthMi,
    to: (i + 1) * run.bandWidthMi,
    label: formatBand(i * run.bandWidthMi, (i + 1) * run.bandWidthMi, unit),
  }));
  return (
    <>
      <PageHeader
        title="Patterns"
        description={`Where failures concentrate by cohort and mileage band, and how sure we are. Computed ${run.finishedAt.slice(0, 16).replace("T", " ")} UTC from every repair and odometer reading; each figure with its ${intervalLabel(run.confidenceLevel)}; ${run.signals} signal${run.signals === 1 ? "" : "s"} among ${run.cells.toLocaleString("en-GB")} cells.`}
      />
      <Explorer
        options={{ ...options, bands }}
        unit={unit}
        confidence={run.confidenceLevel}
        initial={{
          heatmapQuery: heatmapQuery(params),
          heatmap: { ...heatmap, run },
          cellsQuery: cellsQuery(params),
          cells: {
            run,
            total: ranked.total,
            cells: ranked.cells.map((c) => ({ ...c, firstSeen: c.firstSeen ?? null })),
          },
        }}
      />
    </>
  );
}
