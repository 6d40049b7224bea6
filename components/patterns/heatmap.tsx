"use client";

import { ResponsiveHeatMap } from "@nivo/heatmap";
import { useRef } from "react";
import { buttonClass } from "@/components/ui/button";
import type { HeatCell, HeatRow } from "@/db/queries/patterns";
import { formatBand, formatBandShort, formatInterval, formatSig } from "@/lib/format";
import {
  certaintyLevel,
  heatColour,
  TOO_LITTLE,
  valueBin,
  type HeatMetric,
} from "@/lib/heat-colour";
import { HeatLegend } from "./heat-legend";

type Datum = { x: string; y: number | null; cell: HeatCell | null; rowLabel: string };

export const METRIC_LABELS: Record<HeatMetric, string> = {
  rate: "Repairs per 10,000 mi",
  ratio: "Rate ratio vs the rest of the fleet",
  share: "Share of vehicles affected",
};

/** The value, interval and method of a cell for one metric. */
export function metricOf(
  metric: HeatMetric,
  c: HeatCell,
): { value: number | null; lower: number | null; upper: number | null; method: string } {
  if (metric === "ratio")
    return {
      value: c.ratio ?? (c.events > 0 && c.ratioLower !== null ? Infinity : null),
      lower: c.ratioLower,
      upper: c.ratioUpper,
      method: "exact conditional (binomial) interval",
    };
  if (metric === "share")
    return {
      value: c.share,
      lower: c.shareLower,
      upper: c.shareUpper,
      method: "Wilson score interval",
    };
  return {
    value: c.rate,
    lower: c.rateLower,
    upper: c.rateUpper,
    method: "exact Poisson (Garwood) interval",
  };
}

function describeCell(
  metric: HeatMetric,
  rowLabel: string,
  band: string,
  c: HeatCell | null,
): string {
  if (!c) return `${rowLabel}, ${band}: no vehicles observed in this band.`;
  if (c.hasTooLittleData)
    return `${rowLabel}, ${band}: too little data (${formatSig(c.exposureMi)} mi of exposure).`;
  const m = metricOf(metric, c);
  const shown = metric === "share" ? `${formatSig((m.value ?? 0) * 100)}%` : formatSig(m.value);
  return `${rowLabel}, ${band}: ${shown} (95% ${formatInterval(m.lower, m.upper)}), ${c.events} events in ${formatSig(c.exposureMi)} mi, ${c.vehicles} vehicles${c.isSignal ? ", signal" : ""}.`;
}

export function Heatmap({
  rows,
  bands,
  metric,
  unit,
  onOpenCell,
  title,
}: {
  rows: HeatRow[];
  bands: { band: number; from: number; to: number }[];
  metric: HeatMetric;
  unit: "mi" | "km";
  onOpenCell: (row: HeatRow, cell: HeatCell) => void;
  title: string;
}) {
  const box = useRef<HTMLDivElement>(null);
  const bandLabel = (b: { from: number; to: number }) => formatBandShort(b.from, b.to, unit);
  const maxValue = Math.max(
    0,
    ...rows
      .flatMap((r) =>
        r.cells.filter((c) => !c.hasTooLittleData).map((c) => metricOf(metric, c).value ?? 0),
      )
      .filter(Number.isFinite),
  );
  const data = rows.map((r) => ({
    id: r.label,
    data: bands.map((b): Datum => {
      const cell = r.cells.find((c) => c.band === b.band) ?? null;
      const v = cell ? metricOf(metric, cell).value : null;
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
    const m = metricOf(metric, cell);
    const value = m.value === Infinity ? Number.MAX_VALUE : (m.value ?? 0);
    return heatColour(
      metric,
      valueBin(metric, value, maxValue),
      certaintyLevel(metric, m.lower, m.upper, maxValue),
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
  const height = Math.max(160, rows.length * 34 + 90);
  return (
    <div>
      <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
        <HeatLegend metric={metric} />
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
          margin={{ top: 40, right: 16, bottom: 16, left: 210 }}
          axisTop={{ tickSize: 0, tickPadding: 8 }}
          axisLeft={{ tickSize: 0, tickPadding: 8 }}
          xInnerPadding={0.06}
          yInnerPadding={0.1}
          borderRadius={2}
          colors={(c) => colourOf((c.data as Datum).cell)}
          emptyColor="#ffffff"
          label={(c) => {
            const cell = (c.data as Datum).cell;
            if (!cell) return "";
            if (cell.hasTooLittleData) return "n/a";
            const m = metricOf(metric, cell);
            if (m.value === Infinity) return "∞";
            return metric === "share"
              ? `${Math.round((m.value ?? 0) * 100)}%`
              : formatSig(m.value, 2);
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
                className="max-w-xs rounded-md border border-line bg-panel px-3 py-2 text-xs shadow"
                role="tooltip"
              >
                <p className="font-semibold">{d.rowLabel}</p>
                <p className="text-ink-soft">{b ? formatBand(b.from, b.to, unit) : d.x}</p>
                {d.cell ? (
                  <CellFacts metric={metric} cell={d.cell} />
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
      {/* The same cells as a table: keyboard reachable, and what a screen reader reads. */}
      <details className="mt-3">
        <summary className="cursor-pointer text-sm text-sea-700">
          Show the heatmap as a table
        </summary>
        <div className="mt-2 overflow-x-auto">
          <table className="w-full text-left text-xs">
            <caption className="sr-only">{title}</caption>
            <thead>
              <tr>
                <th scope="col" className="py-1 pr-2 font-medium">
                  Row
                </th>
                {bands.map((b) => (
                  <th key={b.band} scope="col" className="whitespace-nowrap py-1 pr-2 font-medium">
                    {formatBand(b.from, b.to, unit)}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.id} className="border-t border-line/60">
                  <th scope="row" className="py-1 pr-2 font-medium">
                    {r.label}
                  </th>
                  {bands.map((b) => {
                    const c = r.cells.find((x) => x.band === b.band) ?? null;
                    const text = describeCell(metric, r.label, formatBand(b.from, b.to, unit), c);
                    return (
                      <td key={b.band} className="py-1 pr-2">
                        {c ? (
                          <button
                            type="button"
                            className="text-left text-sea-700 underline-offset-2 hover:underline"
                            onClick={() => onOpenCell(r, c)}
                            aria-label={text}
                          >
                            {c.hasTooLittleData
                              ? "too little data"
                              : metric === "share"
                                ? `${formatSig((metricOf(metric, c).value ?? 0) * 100)}%`
                                : formatSig(metricOf(metric, c).value)}
                          </button>
                        ) : (
                          "—"
                        )}
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </details>
    </div>
  );
}

export function CellFacts({ metric, cell }: { metric: HeatMetric; cell: HeatCell }) {
  if (cell.hasTooLittleData) {
    return (
      <p>
        Too little data: {formatSig(cell.exposureMi)} mi of exposure, {cell.events} events. Not
        tested.
      </p>
    );
  }
  const m = metricOf(metric, cell);
  return (
    <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-2">
      <dt>{METRIC_LABELS[metric]}</dt>
      <dd data-testid="tooltip-value">
        {metric === "share"
          ? `${formatSig((m.value ?? 0) * 100)}%`
          : m.value === Infinity
            ? "no events elsewhere"
            : formatSig(m.value)}
      </dd>
      <dt>95% interval</dt>
      <dd data-testid="tooltip-interval">
        {metric === "share"
          ? `${formatSig((m.lower ?? 0) * 100)}–${formatSig((m.upper ?? 0) * 100)}%`
          : formatInterval(m.lower, m.upper)}
      </dd>
      <dt>Method</dt>
      <dd>{m.method}</dd>
      <dt>Events</dt>
      <dd>{cell.events}</dd>
      <dt>Exposure</dt>
      <dd>{formatSig(cell.exposureMi)} mi</dd>
      <dt>Vehicles</dt>
      <dd>
        {cell.vehiclesAffected} of {cell.vehicles} affected
      </dd>
      {cell.isSignal ? (
        <>
          <dt>Signal</dt>
          <dd>yes (q = {formatSig(cell.qValue, 2)})</dd>
        </>
      ) : null}
    </dl>
  );
}
