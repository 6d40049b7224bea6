"use client";

import { ResponsiveLine } from "@nivo/line";
import type { McfPoint } from "@/lib/stats";
import { formatSig } from "@/lib/format";

/** At most this many points are drawn; the MCF is a step function, so thinning keeps its shape. */
const MAX_POINTS = 400;

/**
 * Nelson's mean cumulative function of one fault over mileage for a cohort, with its limits
 * (Lawless–Nadeau variance, log-scale limits), drawn with nivo's line chart.
 */
export function McfChart({
  points,
  unitLabel,
  bandFrom,
  bandTo,
}: {
  points: McfPoint[];
  unitLabel: string;
  bandFrom: number;
  bandTo: number;
}) {
  const step = Math.max(1, Math.ceil(points.length / MAX_POINTS));
  const thinned = points.filter((_, i) => i % step === 0 || i === points.length - 1);
  const series = [
    {
      id: "upper limit",
      data: thinned.map((p) => ({ x: p.at, y: Number.isFinite(p.upper) ? p.upper : null })),
    },
    { id: "repairs per vehicle (MCF)", data: thinned.map((p) => ({ x: p.at, y: p.mcf })) },
    { id: "lower limit", data: thinned.map((p) => ({ x: p.at, y: p.lower })) },
  ];
  if (points.length === 0)
    return <p className="text-sm text-ink-soft">No repairs of this fault in the cohort yet.</p>;
  return (
    <div style={{ height: 280 }}>
      <ResponsiveLine
        data={series}
        role="img"
        ariaLabel={`Mean cumulative repairs per vehicle against ${unitLabel}: ${formatSig(points.at(-1)?.mcf)} by ${formatSig(points.at(-1)?.at)} ${unitLabel}.`}
        margin={{ top: 12, right: 24, bottom: 44, left: 56 }}
        xScale={{ type: "linear", min: 0 }}
        yScale={{ type: "linear", min: 0, max: "auto" }}
        curve="stepAfter"
        colors={["#8fa6c7", "#1b4d62", "#8fa6c7"]}
        lineWidth={2}
        enablePoints={false}
        enableGridX={false}
        axisBottom={{
          legend: `odometer (${unitLabel})`,
          legendOffset: 34,
          legendPosition: "middle",
          format: (v) => `${Math.round(Number(v) / 1000)}k`,
        }}
        axisLeft={{ legend: "repairs per vehicle", legendOffset: -44, legendPosition: "middle" }}
        markers={[
          { axis: "x", value: bandFrom, lineStyle: { stroke: "#c27412", strokeDasharray: "4 3" } },
          { axis: "x", value: bandTo, lineStyle: { stroke: "#c27412", strokeDasharray: "4 3" } },
        ]}
        useMesh
        animate={false}
        tooltip={({ point }) => (
          <div className="rounded border border-line bg-panel px-2 py-1 text-xs shadow">
            {String(point.seriesId)}: {formatSig(Number(point.data.y))} at{" "}
            {formatSig(Number(point.data.x))} {unitLabel}
          </div>
        )}
        theme={{ text: { fontSize: 12, fill: "#1c2830" } }}
      />
    </div>
  );
}
