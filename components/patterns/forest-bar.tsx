/**
 * One row of a forest plot: the rate ratio and its interval on a log axis shared by every row
 * of the table (so bars can be compared), with the no-difference line at 1.
 */
export const FOREST_DOMAIN: [number, number] = [0.1, 100];

export function ForestBar({
  ratio,
  lower,
  upper,
  width = 160,
}: {
  ratio: number | null;
  lower: number | null;
  upper: number | null;
  width?: number;
}) {
  const [lo, hi] = FOREST_DOMAIN;
  const x = (v: number) =>
    ((Math.log10(Math.min(hi, Math.max(lo, v))) - Math.log10(lo)) /
      (Math.log10(hi) - Math.log10(lo))) *
    width;
  const left = x(lower ?? lo);
  const right = upper === null || !Number.isFinite(upper) ? width : x(upper);
  const isOpen = upper === null || !Number.isFinite(upper) || upper > hi;
  const point = ratio === null ? null : x(ratio);
  return (
    <svg width={width} height={16} aria-hidden="true" className="block">
      <line x1={x(1)} x2={x(1)} y1={0} y2={16} stroke="#b6ae9c" strokeDasharray="2 2" />
      <line x1={left} x2={right} y1={8} y2={8} stroke="#1b4d62" strokeWidth={2} />
      {isOpen ? (
        <path
          d={`M${width - 5},4 L${width},8 L${width - 5},12`}
          fill="none"
          stroke="#1b4d62"
          strokeWidth={2}
        />
      ) : null}
      {point !== null ? <rect x={point - 3} y={5} width={6} height={6} fill="#c27412" /> : null}
    </svg>
  );
}

/** The shared axis under the forest plot column. */
export function ForestAxis({ width = 160 }: { width?: number }) {
  const [lo, hi] = FOREST_DOMAIN;
  const ticks = [0.1, 1, 10, 100];
  const x = (v: number) =>
    ((Math.log10(v) - Math.log10(lo)) / (Math.log10(hi) - Math.log10(lo))) * width;
  return (
    <svg width={width} height={14} aria-hidden="true" className="block">
      {ticks.map((t) => (
        <text
          key={t}
          x={Math.min(width - 10, Math.max(6, x(t)))}
          y={11}
          fontSize={10}
          textAnchor="middle"
          fill="#44535d"
        >
          {t}
        </text>
      ))}
    </svg>
  );
}
