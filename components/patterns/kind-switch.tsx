"use client";

import type { ExplorerParams } from "./query-strings";

const CHOICES = [
  { kind: undefined, label: "Failures", hint: "things that broke" },
  { kind: "wear", label: "Wear", hint: "parts wearing out sooner than on the rest of the fleet" },
] as const;

/**
 * The explorer's switch between failure cells and wear cells (kept in the address as
 * kind=wear). Faults differ between the two, so the fault filter starts again.
 */
export function KindSwitch({
  params,
  setParams,
}: {
  params: ExplorerParams;
  setParams: (patch: Partial<ExplorerParams>) => void;
}) {
  return (
    <fieldset className="flex flex-wrap items-center gap-2 text-sm">
      <legend className="sr-only">Repairs analysed</legend>
      {CHOICES.map((c) => {
        const isOn = params.kind === c.kind;
        return (
          <label
            key={c.label}
            className={`cursor-pointer rounded-full border px-3 py-1 ${isOn ? "border-sea-700 bg-sea-700 text-white" : "border-line-strong bg-panel text-ink hover:bg-sea-50"}`}
          >
            <input
              type="radio"
              name="kind"
              className="mr-1.5 accent-sea-700 align-middle"
              checked={isOn}
              onChange={() => setParams({ kind: c.kind, fault: undefined })}
            />
            <span className="font-medium">{c.label}</span>
            <span className={isOn ? "text-white/85" : "text-ink-soft"}> · {c.hint}</span>
          </label>
        );
      })}
    </fieldset>
  );
}
