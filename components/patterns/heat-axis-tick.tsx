/** Most characters on one line of a row label; longer names wrap onto more lines. */
export const LABEL_LINE_CHARS = 34;
/** Height of one line of a row label, in pixels. */
export const LABEL_LINE_HEIGHT = 14;

/** A label cut into lines at spaces (a word longer than a line stays whole). */
export function wrapLabel(label: string, width = LABEL_LINE_CHARS): string[] {
  const lines: string[] = [];
  let line = "";
  for (const word of label.split(/\s+/).filter(Boolean)) {
    if (line && line.length + 1 + word.length > width) {
      lines.push(line);
      line = word;
    } else line = line ? `${line} ${word}` : word;
  }
  if (line) lines.push(line);
  return lines.length ? lines : [label];
}

/**
 * A row label of the heatmap, never cut: a long fault name wraps onto more lines, and its
 * title carries the whole name for a pointer or a screen reader.
 */
export function WrappedTick({
  value,
  x,
  y,
  textX,
  textY,
  textAnchor,
}: {
  value: string | number;
  x: number;
  y: number;
  textX: number;
  textY: number;
  textAnchor: string;
}) {
  const label = String(value);
  const lines = wrapLabel(label);
  const first = -((lines.length - 1) * LABEL_LINE_HEIGHT) / 2;
  return (
    <g transform={`translate(${x},${y})`}>
      <title>{label}</title>
      <text
        x={textX}
        y={textY}
        textAnchor={textAnchor as "end"}
        dominantBaseline="central"
        style={{ fontSize: 12, fill: "#44535d" }}
      >
        {lines.length === 1
          ? label
          : lines.map((l, i) => (
              <tspan key={i} x={textX} dy={i === 0 ? first : LABEL_LINE_HEIGHT}>
                {l}
              </tspan>
            ))}
      </text>
    </g>
  );
}
