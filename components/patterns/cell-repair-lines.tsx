import Link from "next/link";
import { buttonClass, inputClass } from "@/components/ui/button";
import { Panel } from "@/components/ui/panel";
import { VehicleLink } from "@/components/vehicles/vehicle-link";
import type { CellKey } from "@/db/queries/patterns";
import { formatMoney, formatSig } from "@/lib/format";
import { milesToUnit } from "@/lib/units";

type Line = {
  id: number;
  roNumber: string;
  vehicleId: number;
  unitNumber: string | null;
  vin: string | null;
  openedOn: string;
  odometerMi: number | null;
  complaint: string | null;
  cause: string | null;
  correction: string | null;
  costCents: number;
};

/** "opened 2024-01-01 to 2024-06-30 by Harbour Auto" from the drill-down's filters. */
export function viewWords(key: { from?: string; to?: string; vendor?: string }): string {
  const period =
    key.from && key.to
      ? `opened ${key.from} to ${key.to}`
      : key.from
        ? `opened from ${key.from}`
        : key.to
          ? `opened up to ${key.to}`
          : "";
  return [period, key.vendor ? `by ${key.vendor}` : ""].filter(Boolean).join(" ");
}

/** The repair orders behind a cell, narrowed by period and vendor, with their CSV. */
export function CellRepairLines({
  cellKey: key,
  keyQuery,
  lines,
  vendors,
  isCapped,
  isFiltered,
  isViewStats,
  csvHref,
  unit,
  canSeeVehicles,
}: {
  cellKey: CellKey;
  keyQuery: string;
  lines: Line[];
  vendors: string[];
  isCapped: boolean;
  isFiltered: boolean;
  isViewStats: boolean;
  csvHref: string;
  unit: "mi" | "km";
  canSeeVehicles: boolean;
}) {
  return (
    <Panel title="Repair orders behind this cell" className="mt-4">
      <form
        method="get"
        action="/patterns/cell"
        className="mb-3 flex flex-wrap items-end gap-3 text-sm"
        aria-label="Narrow the repair orders"
      >
        {(["make", "model", "generation", "band", "fault"] as const).map((k) => (
          <input key={k} type="hidden" name={k} value={String(key[k])} />
        ))}
        <label className="flex flex-col gap-1">
          <span className="text-ink-soft">Opened from</span>
          <input type="date" name="from" defaultValue={key.from} className={inputClass} />
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-ink-soft">to</span>
          <input type="date" name="to" defaultValue={key.to} className={inputClass} />
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-ink-soft">Vendor</span>
          <select name="vendor" defaultValue={key.vendor ?? ""} className={inputClass}>
            <option value="">all vendors</option>
            {vendors.map((v) => (
              <option key={v} value={v}>
                {v}
              </option>
            ))}
          </select>
        </label>
        <button type="submit" className={buttonClass.secondary}>
          Apply
        </button>
        {isFiltered ? <Link href={`/patterns/cell?${keyQuery}`}>Clear</Link> : null}
      </form>
      <div className="mb-2 flex justify-between text-sm">
        <span className="text-ink-soft" data-testid="cell-lines-count">
          {lines.length} repair line{lines.length === 1 ? "" : "s"}
          {isCapped ? " (the latest 2,000)" : ""}
          {isFiltered
            ? ` ${viewWords(key)}; cost and downtime above are for these lines.${isViewStats ? "" : " The statistics cover every repair."}`
            : ""}
        </span>
        <a href={csvHref}>Download CSV</a>
      </div>
      <div className="overflow-x-auto">
        <table className="w-full text-left text-sm">
          <caption className="sr-only">Repair orders behind this cell</caption>
          <thead className="text-ink-soft">
            <tr>
              <th scope="col" className="py-1 pr-3 font-medium">
                Repair order
              </th>
              <th scope="col" className="py-1 pr-3 font-medium">
                Vehicle
              </th>
              <th scope="col" className="py-1 pr-3 font-medium">
                Opened
              </th>
              <th scope="col" className="py-1 pr-3 text-right font-medium">
                Odometer
              </th>
              <th scope="col" className="py-1 pr-3 font-medium">
                Complaint
              </th>
              <th scope="col" className="py-1 pr-3 font-medium">
                Cause / correction
              </th>
              <th scope="col" className="py-1 text-right font-medium">
                Parts and labour
              </th>
            </tr>
          </thead>
          <tbody>
            {lines.slice(0, 200).map((l) => (
              <tr key={l.id} className="border-t border-line/60 align-top">
                <td className="whitespace-nowrap py-1.5 pr-3 font-mono text-[13px]">
                  {l.roNumber}
                </td>
                <td className="whitespace-nowrap py-1.5 pr-3">
                  <VehicleLink id={l.vehicleId} canOpen={canSeeVehicles}>
                    {l.unitNumber ?? l.vin ?? `#${l.vehicleId}`}
                  </VehicleLink>
                </td>
                <td className="whitespace-nowrap py-1.5 pr-3">{l.openedOn}</td>
                <td className="whitespace-nowrap py-1.5 pr-3 text-right tabular-nums">
                  {l.odometerMi === null
                    ? "—"
                    : `${formatSig(milesToUnit(l.odometerMi, unit), 6)} ${unit}`}
                </td>
                <td className="py-1.5 pr-3">{l.complaint ?? "—"}</td>
                <td className="py-1.5 pr-3">
                  {l.cause ?? "—"}
                  {l.correction ? (
                    <span className="block text-ink-soft">{l.correction}</span>
                  ) : null}
                </td>
                <td className="py-1.5 text-right tabular-nums">{formatMoney(l.costCents)}</td>
              </tr>
            ))}
          </tbody>
        </table>
        {lines.length > 200 ? (
          <p className="mt-2 text-sm text-ink-soft">Showing 200; the CSV has all {lines.length}.</p>
        ) : null}
      </div>
    </Panel>
  );
}
