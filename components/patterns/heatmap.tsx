"use client";

import { ResponsiveHeatMap } from "@nivo/heatmap";
import { useRef } from "react";
import { buttonClass } from "@/components/ui/button";
import type { HeatRow } from "@/db/queries/patterns";
import type { HeatCell } from "@/lib/cell-types";
import { formatBand, formatBandShort } from "@/lib/format";
import { certaintyLevel, heatColour, TOO_LITTLE, valueBin } from "@/lib/heat-colour";
import type { Metric, MetricContext } from "@/lib/metrics";
import { CellFacts } from "./cell-facts";
import { LABEL_LINE_HEIGHT, WrappedTick, wrapLabel } from "./heat-axis-tick";
import { HeatLegend } from "./heat-legend";
import { HeatTable } from "./heat-table";

type Datum = { x: string; y: number | null; cell: HeatCell | null; rowLabel: string };

export function Heatmap({
  rows,
  bands,
  metric: m,
  ctx,
  onOpenCell,
  title,
}: {
  rows: HeatRow[];
  bands: { band: number; from: number; to: number }[];
  /** The metric the colour shows (lib/metrics.ts). */
  metric: Metric;
  ctx: MetricContext;
  onOpenCell: (row: HeatRow, cell: HeatCell) => void;
  title: string;
}) {
  const box = useRef<HTMLDivElement>(null);
  const unit = ctx.unit;
  const bandLabel = (b: { from: number; to: number }) => formatBandShort(b.from, b.to, unit);
  const valueOf = (c: HeatCell) => m.value(c, unit);
  const maxValue = Math.max(
    0,
    ...rows
      .flatMap((r) => r.cells.filter((c) => !c.hasTooLittleData).map((c) => valueOf(c) ?? 0))
      .filter(Number.isFinite),
  );
  const data = rows.map((r) => ({
    id: r.label,
    data: bands.map((b): Datum => {
      const cell = r.cells.find((c) => c.bandIndex === b.band) ?? null;
      const v = cell ? valueOf(cell) : null;
      return {
        x: bandLabel(b),
        y:
          cell === null
            ? null
            : cell.hasTooLittleData
              ? 0
              : Number.isFinite(v ?? NaN)
                ? (v as number)
                : v === Infinity
                  ? maxValue
                  : 0,
        cell,
        rowLabel: r.label,
      };
    }),
  }));
  const colourOf = (cell: HeatCell | null) => {
    if (!cell) return "#ffffff";
    if (cell.hasTooLittleData) return TOO_LITTLE;
    const value = valueOf(cell);
    const { lower, upper } = m.interval(cell, unit);
    return heatColour(
      m.scale,
      valueBin(m.scale, value === Infinity ? Number.MAX_VALUE : (value ?? 0), maxValue),
      certaintyLevel(m.scale, lower, upper, maxValue),
    );
  };

  const download = async (kind: "svg" | "png") => {
    const svg = box.current?.querySelector("svg");
    if (!svg) return;
    const clone = svg.cloneNode(true) as SVGSVGElement;
    clone.setAttribute("xmlns", "http://www.w3.org/2000/svg");
    const text = new XMLSerializer().serializeToString(clone);
    const blob = new Blob([text], { type: "image/svg+xml" });
    const save = (b: Blob, name: string) => {
      const a = document.createElement("a");
      a.href = URL.createObjectURL(b);
      a.download = name;
      a.click();
      URL.revokeObjectURL(a.href);
    };
    if (kind === "svg") return save(blob, "recurra-heatmap.svg");
    const img = new Image();
    img.src = URL.createObjectURL(blob);
    await img.decode();
    const canvas = document.createElement("canvas");
    canvas.width = svg.clientWidth * 2;
    canvas.height = svg.clientHeight * 2;
    const ctx = canvas.getContext("2d");
    if (!ctx) return;
    ctx.fillStyle = "#ffffff";
    ctx.fillRect(0, 0, canvas.width, canvas.height);
    ctx.drawImage(img, 0, 0, canvas.width, canvas.height);
    canvas.toBlob((png) => png && save(png, "recurra-heatmap.png"), "image/png");
  };

  if (rows.length === 0) {
    return (
      <p className="rounded-md bg-paper p-4 text-sm text-ink-soft">No cells match these filters.</p>
    );
  }
  // Rows grow with their labels: a long fault name wraps rather than being cut.
  const rowHeight = Math.max(
    34,
    ...rows.map((r) => wrapLabel(r.label).length * LABEL_LINE_HEIGHT + 8),
  );
  const height = Math.max(160, rows.length * rowHeight + 90);
  return (
    <div>
      <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
        <HeatLegend metric={m} unit={unit} />
        <div className="flex gap-2">
          <button type="button" className={buttonClass.quiet} onClick={() => void download("svg")}>
            Download SVG
          </button>
          <button type="button" className={buttonClass.quiet} onClick={() => void download("png")}>
            Download PNG
          </button>
        </div>
      </div>
      <div ref={box} style={{ height }} className="w-full" data-testid="heatmap">
        <ResponsiveHeatMap<Datum, Record<string, never>>
          data={data as never}
          margin={{ top: 40, right: 16, bottom: 16, left: 240 }}
          axisTop={{ tickSize: 0, tickPadding: 8 }}
          axisLeft={{ tickSize: 0, tickPadding: 8, renderTick: WrappedTick }}
          xInnerPadding={0.06}
          yInnerPadding={0.1}
          borderRadius={2}
          colors={(c) => colourOf((c.data as Datum).cell)}
          emptyColor="#ffffff"
          label={(c) => {
            const cell = (c.data as Datum).cell;
            if (!cell) return "";
            if (cell.hasTooLittleData) return "n/a";
            return m.format(valueOf(cell), m.interval(cell, unit));
          }}
          labelTextColor={(c) => {
            const hex = c.color.replace("#", "");
            const v = parseInt(hex, 16);
            const l = 0.2126 * ((v >> 16) & 255) + 0.7152 * ((v >> 8) & 255) + 0.0722 * (v & 255);
            return l < 140 ? "#ffffff" : "#1c2830";
          }}
          theme={{
            text: { fontSize: 12, fill: "#1c2830" },
            axis: { ticks: { text: { fontSize: 12, fill: "#44535d" } } },
          }}
          hoverTarget="cell"
          animate={false}
          tooltip={({ cell }) => {
            const d = cell.data as Datum;
            const b = bands.find((x) => bandLabel(x) === d.x);
            return (
              <div
                className="w-80 rounded-md border border-line bg-panel px-3 py-2 text-xs shadow"
                role="tooltip"
              >
                <p className="font-semibold">{d.rowLabel}</p>
                <p className="text-ink-soft">{b ? formatBand(b.from, b.to, unit) : d.x}</p>
                {d.cell ? (
                  <CellFacts metric={m} cell={d.cell} ctx={ctx} />
                ) : (
                  <p>No vehicles observed in this band.</p>
                )}
              </div>
            );
          }}
          onClick={(c) => {
            const d = c.data as Datum;
            const row = rows.find((r) => r.label === d.rowLabel);
            if (row && d.cell) onOpenCell(row, d.cell);
          }}
          role="img"
          ariaLabel={title}
        />
      </div>
      <HeatTable
        rows={rows}
        bands={bands}
        metric={m}
        ctx={ctx}
        title={title}
        onOpenCell={onOpenCell}
      />
    </div>
  );
}
