"use client";

import {
  ResponsiveScatterPlot,
  type ScatterPlotLayerProps,
  type ScatterPlotTooltipProps,
} from "@nivo/scatterplot";
import { createContext, useContext, useId, useMemo, useState } from "react";
import { formatDistance, milesToUnit } from "@/lib/units";
import {
  KIND_STYLE,
  KindMarker,
  markerPath,
  TIMELINE_KINDS,
  type TimelineKind,
  type TimelineRecord,
} from "./timeline-kinds";

type Unit = "mi" | "km";
type Axis = "mileage" | "date";
type Datum = { x: number | Date; y: number; record: TimelineRecord };

/** Where a record sits on the mileage axis: nowhere without a plausible reading. */
const mileOf = (r: TimelineRecord) => (r.isOdometerDoubtful ? null : r.odometerMi);

/** A mileage band to shade on the mileage axis (a pattern the vehicle is in or approaching). */
export type TimelineBand = { fromMi: number; toMi: number; label: string };

type Overlay = { axis: Axis; unit: Unit; bands: TimelineBand[]; currentOdometerMi: number | null };
const OverlayContext = createContext<Overlay | null>(null);

const INK = "#1c2830";
const BAND_FILL = "#E69F00";
const MARKER_SIZE = 11;
const MONTH_YEAR = new Intl.DateTimeFormat("en-GB", {
  month: "short",
  year: "numeric",
  timeZone: "UTC",
});

const THEME = {
  text: { fontSize: 13, fill: INK },
  axis: {
    ticks: { text: { fontSize: 12, fill: "#44535d" }, line: { stroke: "#b6ae9c" } },
    legend: { text: { fontSize: 13, fill: INK } },
    domain: { line: { stroke: "#b6ae9c", strokeWidth: 1 } },
  },
  grid: { line: { stroke: "#e4dfd3", strokeWidth: 1 } },
};

/** A label cut to about the width it may take (12 px text is about 7 px a character). */
function fitLabel(label: string, widthPx: number): string {
  const chars = Math.floor(widthPx / 7);
  return label.length <= chars ? label : chars < 2 ? "" : `${label.slice(0, chars - 1)}…`;
}

/** Shaded pattern bands and the vehicle's odometer now, under the markers (mileage axis only). */
function OverlayLayer({ xScale, innerWidth, innerHeight }: ScatterPlotLayerProps<Datum>) {
  const overlay = useContext(OverlayContext);
  if (!overlay || overlay.axis !== "mileage") return null;
  const x = (mi: number) => (xScale as (v: number) => number)(milesToUnit(mi, overlay.unit));
  const clamp = (px: number) => Math.min(Math.max(px, 0), innerWidth);
  const now = overlay.currentOdometerMi;
  return (
    <g aria-hidden="true">
      {overlay.bands.map((band) => {
        const left = clamp(x(band.fromMi));
        const right = clamp(x(band.toMi));
        if (right - left < 1) return null;
        return (
          <g key={`${band.fromMi}-${band.toMi}`}>
            <rect
              x={left}
              y={0}
              width={right - left}
              height={innerHeight}
              fill={BAND_FILL}
              fillOpacity={0.14}
              stroke="#8a520b"
              strokeDasharray="5 4"
            />
            <text x={left + 4} y={-8} fontSize={12} fill="#8a520b">
              {fitLabel(band.label, right - left - 4)}
            </text>
          </g>
        );
      })}
      {now !== null && x(now) >= 0 && x(now) <= innerWidth ? (
        <g>
          <line
            x1={x(now)}
            x2={x(now)}
            y1={0}
            y2={innerHeight}
            stroke={INK}
            strokeWidth={1.5}
            strokeDasharray="2 3"
          />
          <text x={x(now) - 4} y={innerHeight - 6} fontSize={12} fill={INK} textAnchor="end">
            now {formatDistance(now, overlay.unit)}
          </text>
        </g>
      ) : null}
    </g>
  );
}

/** Each record as its kind's shape; hovering is handled by the chart's mesh. */
function MarkersLayer({ nodes }: ScatterPlotLayerProps<Datum>) {
  return (
    <g>
      {nodes.map((node) => {
        const { colour, shape } = KIND_STYLE[node.data.record.kind];
        return (
          <path
            key={node.id}
            d={markerPath(shape, node.x, node.y, MARKER_SIZE)}
            fill={colour}
            fillOpacity={node.data.record.kind === "fill-up" ? 0.55 : 0.9}
            stroke="#ffffff"
            strokeWidth={0.75}
          />
        );
      })}
    </g>
  );
}

function RecordTooltip({ node }: ScatterPlotTooltipProps<Datum>) {
  const r = node.data.record;
  return (
    <div className="w-72 max-w-[80vw] rounded-md border border-line-strong bg-panel p-3 text-sm text-ink shadow-lg">
      <p className="flex items-center gap-2 font-medium">
        <KindMarker kind={r.kind} /> {KIND_STYLE[r.kind].label}
      </p>
      <p className="text-ink-soft">
        {r.when} · {r.odometer}
      </p>
      <p className="mt-1">{r.summary}</p>
      {r.details.length > 0 ? (
        <ul className="mt-1 space-y-0.5 text-[13px] text-ink-soft">
          {r.details.slice(0, 8).map((d, i) => (
            <li key={i}>{d}</li>
          ))}
          {r.details.length > 8 ? <li>… and more in the records table</li> : null}
        </ul>
      ) : null}
    </div>
  );
}

/**
 * A vehicle's records on one axis (odometer or date), one lane per kind of record. The same
 * records are listed in the table under the chart, which is the keyboard and screen-reader way in.
 */
export function TimelineChart({
  records,
  unit,
  currentOdometerMi,
  bands,
}: {
  records: TimelineRecord[];
  unit: Unit;
  currentOdometerMi: number | null;
  bands: TimelineBand[];
}) {
  const hasOdometers = records.some((r) => mileOf(r) !== null);
  const [axis, setAxis] = useState<Axis>(hasOdometers ? "mileage" : "date");
  const groupId = useId();
  const lanes = useMemo(
    () =>
      TIMELINE_KINDS.filter((kind) => kind !== "reading" || records.some((r) => r.kind === kind)),
    [records],
  );

  const series = useMemo(() => {
    const laneOf = (kind: TimelineKind) => lanes.length - 1 - lanes.indexOf(kind);
    return lanes.map((kind) => ({
      id: kind,
      data: records
        .filter((r) => r.kind === kind && (axis === "date" || mileOf(r) !== null))
        .map((r): Datum => ({
          x: axis === "date" ? new Date(r.at) : milesToUnit(mileOf(r) ?? 0, unit),
          y: laneOf(kind),
          record: r,
        })),
    }));
  }, [lanes, records, axis, unit]);
  const laneValues = lanes.map((_, i) => i);
  const plotted = series.reduce((n, s) => n + s.data.length, 0);
  const offAxis = records.length - plotted;

  // The mileage axis reaches the bands ahead that the vehicle is approaching.
  const mileageDomain = useMemo(() => {
    const miles = [
      ...records.flatMap((r) => mileOf(r) ?? []),
      ...bands.flatMap((b) => [b.fromMi, b.toMi]),
      ...(currentOdometerMi === null ? [] : [currentOdometerMi]),
    ].map((mi) => milesToUnit(mi, unit));
    const min = Math.min(...miles);
    const max = Math.max(...miles);
    return { min, max: max > min ? max : min + 1000 };
  }, [records, bands, currentOdometerMi, unit]);

  const counts = lanes
    .map((kind) => `${records.filter((r) => r.kind === kind).length} ${KIND_STYLE[kind].lane}`)
    .join(", ");
  const overlay = useMemo(
    () => ({ axis, unit, bands, currentOdometerMi }),
    [axis, unit, bands, currentOdometerMi],
  );

  return (
    <div>
      <div className="mb-3 flex flex-wrap items-center justify-between gap-3">
        <fieldset className="flex flex-wrap items-center gap-3 text-sm">
          <legend className="sr-only">Horizontal axis</legend>
          <span className="text-ink-soft" aria-hidden="true">
            Along:
          </span>
          {(
            [
              ["mileage", `Mileage (${unit})`],
              ["date", "Date"],
            ] as const
          ).map(([value, label]) => (
            <label
              key={value}
              className="flex cursor-pointer items-center gap-1.5 rounded-md border border-line-strong px-3 py-1.5 has-[:checked]:border-sea-700 has-[:checked]:bg-sea-50 has-[:checked]:font-medium"
            >
              <input
                type="radio"
                name={groupId}
                value={value}
                checked={axis === value}
                disabled={value === "mileage" && !hasOdometers}
                onChange={() => setAxis(value)}
                className="accent-sea-700"
              />
              {label}
            </label>
          ))}
        </fieldset>
        <ul className="flex flex-wrap gap-x-4 gap-y-1 text-sm" aria-label="Legend">
          {lanes.map((kind) => (
            <li key={kind} className="flex items-center gap-1.5">
              <KindMarker kind={kind} /> {KIND_STYLE[kind].lane}
            </li>
          ))}
          {axis === "mileage" && bands.length > 0 ? (
            <li className="flex items-center gap-1.5">
              <span
                aria-hidden="true"
                className="inline-block h-3 w-4 border border-dashed border-ochre-700 bg-[#E69F00]/20"
              />
              Pattern band
            </li>
          ) : null}
        </ul>
      </div>
      <div className="h-72 w-full" data-testid="timeline-chart">
        {plotted === 0 ? (
          <p className="flex h-full items-center justify-center rounded-md border border-dashed border-line text-sm text-ink-soft">
            {records.length === 0
              ? "Nothing recorded for this vehicle yet."
              : "No record has an odometer reading; switch to the date axis."}
          </p>
        ) : (
          <OverlayContext.Provider value={overlay}>
            <ResponsiveScatterPlot<Datum>
              data={series}
              role="img"
              ariaLabel={`Timeline chart by ${axis === "mileage" ? "odometer" : "date"}: ${counts}. The same records are listed in the records table.`}
              margin={{ top: 28, right: 20, bottom: 52, left: 96 }}
              xScale={
                axis === "mileage"
                  ? { type: "linear", min: mileageDomain.min, max: mileageDomain.max, nice: true }
                  : { type: "time", format: "native", useUTC: true }
              }
              yScale={{ type: "linear", min: -0.6, max: lanes.length - 0.4 }}
              axisBottom={{
                tickValues: 6,
                tickSize: 5,
                legend: axis === "mileage" ? `Odometer (${unit})` : "Date (UTC)",
                legendPosition: "middle",
                legendOffset: 40,
                format: (v: number | Date) =>
                  v instanceof Date
                    ? MONTH_YEAR.format(v)
                    : Math.round(Number(v)).toLocaleString("en-GB"),
              }}
              axisLeft={{
                tickValues: laneValues,
                tickSize: 0,
                tickPadding: 10,
                format: (v: number) => KIND_STYLE[lanes[lanes.length - 1 - v] ?? "repair"].lane,
              }}
              enableGridX
              gridYValues={laneValues}
              theme={THEME}
              animate={false}
              useMesh
              tooltip={RecordTooltip}
              layers={["grid", "axes", OverlayLayer, MarkersLayer, "mesh"]}
            />
          </OverlayContext.Provider>
        )}
      </div>
      {offAxis > 0 && axis === "mileage" ? (
        <p className="mt-2 text-sm text-ink-soft">
          {offAxis} record{offAxis === 1 ? " has" : "s have"} no odometer reading or one the
          statistics ignore (backwards, or an impossible jump);{" "}
          {offAxis === 1 ? "it is" : "they are"} on the date axis and in the table.
        </p>
      ) : null}
    </div>
  );
}
