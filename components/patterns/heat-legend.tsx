import { heatColour, RATIO_EDGES, TOO_LITTLE } from "@/lib/heat-colour";
import type { DistanceUnit, Metric } from "@/lib/metrics";

const CERTAINTY = ["narrow interval", "", "", "wide interval"];

/**
 * The legend explains both axes of the colour: across, the value; down, how sure we are
 * (colours merge and fade towards neutral as the interval widens).
 */
export function HeatLegend({ metric, unit }: { metric: Metric; unit: DistanceUnit }) {
  const scale = metric.scale;
  const valueLabels =
    scale === "ratio"
      ? [
          `< ${RATIO_EDGES[0]}`,
          `${RATIO_EDGES[0]}–${RATIO_EDGES[1]}`,
          `${RATIO_EDGES[1]}–${RATIO_EDGES[2]}`,
          `${RATIO_EDGES[2]}–${RATIO_EDGES[3]}`,
          `> ${RATIO_EDGES[3]}`,
        ]
      : ["lowest", "", "", "", "highest"];
  return (
    <figure className="flex items-end gap-4 text-xs text-ink-soft" aria-label="Colour legend">
      <div>
        <div className="grid grid-cols-[auto_repeat(5,2.25rem)] items-center gap-0.5">
          {[0, 1, 2, 3].map((certainty) => (
            <div key={certainty} className="contents">
              <span className="pr-2 text-right">{CERTAINTY[certainty]}</span>
              {[0, 1, 2, 3, 4].map((bin) => (
                <span
                  key={bin}
                  className="h-4 w-6 rounded-sm"
                  style={{ background: heatColour(scale, bin, certainty) }}
                />
              ))}
            </div>
          ))}
          <span />
          {valueLabels.map((l, i) => (
            <span key={i} className="text-center leading-tight">
              {l}
            </span>
          ))}
        </div>
        <figcaption className="mt-1">
          {metric.label(unit)}
          {scale === "ratio"
            ? " (1 = like the rest of the fleet)"
            : ", relative to this map's highest"}
          ; wide intervals fade towards grey.
        </figcaption>
      </div>
      <div className="flex items-center gap-1">
        <span
          className="inline-block h-4 w-6 rounded-sm border border-line"
          style={{ background: TOO_LITTLE }}
        />
        <span>n/a: too little data</span>
      </div>
    </figure>
  );
}
