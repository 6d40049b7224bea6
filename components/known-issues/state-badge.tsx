import type { KnownIssueState } from "@/db/schema/known-issues";
import { STATE_LABELS } from "@/lib/known-issues";

/** Each state in its own tone; the word is always written, so colour is never the only cue. */
const TONES: Record<KnownIssueState, string> = {
  watching: "border-sea-600 text-sea-800 bg-sea-50",
  confirmed: "border-ochre-700 text-ochre-700 bg-ochre-100",
  mitigated: "border-ok-700 text-ok-700 bg-white",
  retired: "border-line-strong text-ink-soft bg-white",
};

export function StateBadge({ state }: { state: KnownIssueState }) {
  return (
    <span
      className={`inline-block rounded-full border px-2.5 py-0.5 text-sm font-semibold ${TONES[state]}`}
      data-testid="state-badge"
    >
      {STATE_LABELS[state].label}
    </span>
  );
}
