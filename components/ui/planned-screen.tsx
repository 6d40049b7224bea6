import { Panel } from "./panel";

/** Honest placeholder for a screen that a later piece of work builds. */
export function PlannedScreen({ what, points }: { what: string; points: string[] }) {
  return (
    <Panel>
      <p className="inline-block rounded bg-ochre-100 px-2 py-0.5 text-sm font-medium text-ochre-700">
        Coming soon
      </p>
      <p className="mt-3 text-ink">{what}</p>
      <ul className="mt-3 list-disc space-y-1 pl-5 text-ink-soft">
        {points.map((p) => (
          <li key={p}>{p}</li>
        ))}
      </ul>
      <p className="mt-4 text-sm text-ink-soft">
        This screen is not built yet. Nothing shown here is a result.
      </p>
    </Panel>
  );
}
