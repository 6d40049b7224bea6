import { Panel } from "./panel";

/**
 * One headline figure: what it is, the figure, a line in words under it and, when given, its
 * details one click away (a FigureDetails).
 */
export function FigureCard({
  label,
  value,
  note,
  details,
  testId,
}: {
  label: string;
  value: React.ReactNode;
  note?: React.ReactNode;
  details?: React.ReactNode;
  testId?: string;
}) {
  return (
    <Panel>
      <p className="text-sm text-ink-soft">{label}</p>
      <p className="text-2xl font-semibold tabular-nums" data-testid={testId}>
        {value}
      </p>
      {note ? <p className="text-xs text-ink-soft">{note}</p> : null}
      {details}
    </Panel>
  );
}
