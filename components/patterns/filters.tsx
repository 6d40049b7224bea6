"use client";

import { buttonClass } from "@/components/ui/button";
import type { ExplorerParams } from "./query-strings";

export type PatternOptions = {
  cohorts: { make: string; model: string; generation: string }[];
  faults: {
    value: string;
    label: string;
    system: string | null;
    kind: "failure" | "wear" | "service";
    events: number;
  }[];
  bands: { from: number; to: number; label: string }[];
};

const selectClass = "w-full rounded-md border border-line-strong bg-white px-2 py-1.5 text-sm";

export function Filters({
  options,
  params,
  setParams,
}: {
  options: PatternOptions;
  params: ExplorerParams;
  setParams: (patch: Partial<ExplorerParams>) => void;
}) {
  const makes = [...new Set(options.cohorts.map((c) => c.make))];
  const models = [
    ...new Set(
      options.cohorts.filter((c) => !params.make || c.make === params.make).map((c) => c.model),
    ),
  ];
  const generations = [
    ...new Set(
      options.cohorts
        .filter(
          (c) =>
            (!params.make || c.make === params.make) && (!params.model || c.model === params.model),
        )
        .map((c) => c.generation),
    ),
  ];
  // The faults of the kind on view (failures, or wear), and their systems by name.
  const faults = options.faults.filter((f) => f.kind === (params.kind ?? "failure"));
  const systems = new Map<string, string>();
  for (const f of faults) {
    const slug = f.value.includes("/") ? f.value.split("/")[0] : null;
    if (slug && !systems.has(slug)) systems.set(slug, f.system ?? slug);
  }
  // The vendor box is typed into: it applies on Enter or on leaving it, not on every key.
  const commitVendor = (value: string) => {
    const vendor = value.trim() || undefined;
    if (vendor !== params.vendor) setParams({ vendor });
  };
  return (
    <section
      aria-label="Filters"
      className="grid gap-3 rounded-lg border border-line bg-panel p-4 sm:grid-cols-3 lg:grid-cols-7"
    >
      <label className="block text-sm">
        <span className="mb-1 block font-medium">Make</span>
        <select
          className={selectClass}
          value={params.make ?? ""}
          onChange={(e) =>
            setParams({
              make: e.target.value,
              model: undefined,
              generation: undefined,
              view: "cohorts",
            })
          }
        >
          <option value="">all makes</option>
          {makes.map((m) => (
            <option key={m}>{m}</option>
          ))}
        </select>
      </label>
      <label className="block text-sm">
        <span className="mb-1 block font-medium">Model</span>
        <select
          className={selectClass}
          value={params.model ?? ""}
          onChange={(e) => setParams({ model: e.target.value, generation: undefined })}
        >
          <option value="">all models</option>
          {models.map((m) => (
            <option key={m}>{m}</option>
          ))}
        </select>
      </label>
      <label className="block text-sm">
        <span className="mb-1 block font-medium">Generation</span>
        <select
          className={selectClass}
          value={params.generation ?? ""}
          onChange={(e) => setParams({ generation: e.target.value })}
        >
          <option value="">all generations</option>
          {generations.map((g) => (
            <option key={g}>{g}</option>
          ))}
        </select>
      </label>
      <label className="block text-sm lg:col-span-2">
        <span className="mb-1 block font-medium">Fault or system</span>
        <select
          className={selectClass}
          value={params.fault ?? ""}
          onChange={(e) => setParams({ fault: e.target.value })}
        >
          <option value="">{params.kind === "wear" ? "all wear" : "all faults"}</option>
          <optgroup label="Systems">
            {[...systems].map(([slug, name]) => (
              <option key={slug} value={slug}>
                {name} (whole system)
              </option>
            ))}
          </optgroup>
          <optgroup label="Components and DTCs">
            {faults.map((f) => (
              <option key={f.value} value={f.value}>
                {f.label} ({f.events})
              </option>
            ))}
          </optgroup>
        </select>
      </label>
      <label className="block text-sm">
        <span className="mb-1 block font-medium">Bands from</span>
        <select
          className={selectClass}
          value={params.bandFrom ?? ""}
          onChange={(e) => setParams({ bandFrom: e.target.value })}
        >
          <option value="">lowest</option>
          {options.bands.map((b) => (
            <option key={b.from} value={b.from}>
              {b.label}
            </option>
          ))}
        </select>
      </label>
      <label className="block text-sm">
        <span className="mb-1 block font-medium">Bands to</span>
        <select
          className={selectClass}
          value={params.bandTo ?? ""}
          onChange={(e) => setParams({ bandTo: e.target.value })}
        >
          <option value="">highest</option>
          {options.bands.map((b) => (
            <option key={b.to} value={b.to}>
              {b.label}
            </option>
          ))}
        </select>
      </label>
      <label className="block text-sm">
        <span className="mb-1 block font-medium">Repairs from</span>
        <input
          type="date"
          className={selectClass}
          value={params.from ?? ""}
          max={params.to}
          onChange={(e) => setParams({ from: e.target.value || undefined })}
        />
      </label>
      <label className="block text-sm">
        <span className="mb-1 block font-medium">Repairs to</span>
        <input
          type="date"
          className={selectClass}
          value={params.to ?? ""}
          min={params.from}
          onChange={(e) => setParams({ to: e.target.value || undefined })}
        />
      </label>
      <label className="block text-sm lg:col-span-2">
        <span className="mb-1 block font-medium">Vendor (shop that did the repair)</span>
        <input
          key={params.vendor ?? ""}
          type="search"
          className={selectClass}
          defaultValue={params.vendor ?? ""}
          placeholder="any vendor — press Enter"
          onBlur={(e) => commitVendor(e.target.value)}
          onKeyDown={(e) => {
            if (e.key === "Enter") {
              e.preventDefault();
              commitVendor(e.currentTarget.value);
            }
          }}
        />
      </label>
      <p className="text-xs text-ink-soft sm:col-span-3 lg:col-span-3 lg:self-end">
        A period or a vendor counts only those repairs (and, for a period, only the miles driven in
        it); the first view of each takes a few seconds to compute.
      </p>
      <div className="flex flex-wrap items-center gap-3 text-sm sm:col-span-3 lg:col-span-7">
        <label className="flex items-center gap-2">
          <input
            type="checkbox"
            checked={params.signals === "1"}
            onChange={(e) => setParams({ signals: e.target.checked ? "1" : undefined })}
          />
          Only signals
        </label>
        <button
          type="button"
          className={buttonClass.quiet}
          onClick={() =>
            setParams({
              make: undefined,
              model: undefined,
              generation: undefined,
              fault: undefined,
              bandFrom: undefined,
              bandTo: undefined,
              from: undefined,
              to: undefined,
              vendor: undefined,
              signals: undefined,
              view: "cohorts",
            })
          }
        >
          Clear filters
        </button>
        <span className="text-ink-soft">
          The address of this page keeps the filters: copy it to share this view.
        </span>
      </div>
    </section>
  );
}
