"use client";

import { ResponsiveBar } from "@nivo/bar";

export type SinceFillUpBar = {
  /** Bin label in the organisation's unit, e.g. "0–5" or "300+". */
  bin: string;
  observed: number;
  chance: number;
  isInWindow: boolean;
};

const IN_WINDOW = "#24617a"; // sea-600
const OUTSIDE = "#8fb3c4";
const CHANCE = "#c27412"; // ochre-500: differs from the blues in hue and lightness

/**
 * Histogram of miles (or km) since the last fill-up: the stalls and no-starts counted in each
 * bin beside what chance predicts there. Bars inside the window are darker. A small client leaf;
 * the page computes the bins.
 */
export function SinceFillUpChart({
  bars,
  unit,
  title,
}: {
  bars: SinceFillUpBar[];
  unit: "mi" | "km";
  title: string;
}) {
  const data = bars.map((b) => ({
    bin: b.bin,
    Observed: b.observed,
    "Chance predicts": Number(b.chance.toFixed(2)),
    isInWindow: b.isInWindow ? 1 : 0,
  }));
  return (
    <figure data-testid="refuel-histogram">
      <div className="h-72 w-full" role="img" aria-label={title}>
        <ResponsiveBar
          data={data}
          keys={["Observed", "Chance predicts"]}
          indexBy="bin"
          groupMode="grouped"
          margin={{ top: 10, right: 10, bottom: 58, left: 48 }}
          padding={0.15}
          innerPadding={1}
          colors={(bar) =>
            bar.id === "Chance predicts" ? CHANCE : bar.data.isInWindow === 1 ? IN_WINDOW : OUTSIDE
          }
          axisBottom={{
            // At most about 16 labels, so they stay readable on a tablet.
            tickValues: data
              .filter((_, i) => i % Math.max(1, Math.ceil(data.length / 16)) === 0)
              .map((d) => d.bin),
            tickRotation: -50,
            legend: `${unit} since the last fill-up`,
            legendOffset: 50,
            legendPosition: "middle",
          }}
          axisLeft={{ legend: "events", legendOffset: -40, legendPosition: "middle" }}
          enableLabel={false}
          enableGridY
          animate={false}
          isInteractive
          tooltip={({ id, value, indexValue }) => (
            <div className="rounded border border-line bg-panel px-2 py-1 text-xs shadow">
              {indexValue} {unit}: {id === "Observed" ? `${value} events` : `${value} by chance`}
            </div>
          )}
          theme={{ text: { fontSize: 12, fill: "#1c2830" } }}
          role="presentation"
        />
      </div>
      <figcaption className="mt-2 flex flex-wrap gap-4 text-xs text-ink-soft">
        <span className="flex items-center gap-1">
          <span className="inline-block h-3 w-3" style={{ background: IN_WINDOW }} /> events within
          the window
        </span>
        <span className="flex items-center gap-1">
          <span className="inline-block h-3 w-3" style={{ background: OUTSIDE }} /> events beyond it
        </span>
        <span className="flex items-center gap-1">
          <span className="inline-block h-3 w-3" style={{ background: CHANCE }} /> what chance
          predicts (each event equally likely anywhere between its fill-ups)
        </span>
      </figcaption>
    </figure>
  );
}
