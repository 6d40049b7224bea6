/**
 * The kinds of record on a vehicle's timeline, with the colour and marker shape of each. Colours
 * come from the Okabe & Ito palette (Color Universal Design, 2008), which stays distinct for the
 * common colour-vision deficiencies; each kind also has its own shape, so colour is never the
 * only cue.
 */
export const TIMELINE_KINDS = ["repair", "fault", "fill-up", "reading"] as const;
export type TimelineKind = (typeof TIMELINE_KINDS)[number];

type Shape = "square" | "triangle" | "circle" | "diamond";

export const KIND_STYLE: Record<
  TimelineKind,
  { label: string; lane: string; colour: string; shape: Shape }
> = {
  repair: { label: "Repair", lane: "Repairs", colour: "#D55E00", shape: "square" },
  fault: { label: "Fault code", lane: "Fault codes", colour: "#0072B2", shape: "triangle" },
  "fill-up": { label: "Fill-up", lane: "Fill-ups", colour: "#009E73", shape: "circle" },
  reading: { label: "Odometer reading", lane: "Odometer", colour: "#44535D", shape: "diamond" },
};

/** One record of the timeline, already worded for display (chart tooltip and table alike). */
export type TimelineRecord = {
  key: string;
  kind: TimelineKind;
  /** ISO date or UTC timestamp, for ordering and the date axis. */
  at: string;
  /** "2024-03-26" or "2024-03-26 11:28" (UTC). */
  when: string;
  odometerMi: number | null;
  /** A reading the statistics ignore too (backwards or an impossible jump). */
  isOdometerDoubtful: boolean;
  /** In the organisation's unit, or "—". */
  odometer: string;
  summary: string;
  details: string[];
};

/** SVG path of a marker of the given shape, centred on (x, y), about `size` across. */
export function markerPath(shape: Shape, x: number, y: number, size: number): string {
  const h = size / 2;
  switch (shape) {
    case "square":
      return `M${x - h * 0.85},${y - h * 0.85}h${h * 1.7}v${h * 1.7}h${-h * 1.7}Z`;
    case "triangle":
      return `M${x},${y - h}L${x + h},${y + h * 0.8}L${x - h},${y + h * 0.8}Z`;
    case "diamond":
      return `M${x},${y - h}L${x + h},${y}L${x},${y + h}L${x - h},${y}Z`;
    case "circle":
      return `M${x - h},${y}a${h},${h} 0 1,0 ${size},0a${h},${h} 0 1,0 ${-size},0`;
  }
}

/** The kind's marker as a small inline picture (decorative: the kind is always written too). */
export function KindMarker({ kind, size = 12 }: { kind: TimelineKind; size?: number }) {
  const { colour, shape } = KIND_STYLE[kind];
  return (
    <svg
      aria-hidden="true"
      width={size}
      height={size}
      viewBox={`0 0 ${size} ${size}`}
      className="inline-block shrink-0 align-[-1px]"
    >
      <path d={markerPath(shape, size / 2, size / 2, size - 1)} fill={colour} />
    </svg>
  );
}
