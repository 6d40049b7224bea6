import { milesToUnit } from "./units";

/** Display helpers shared by server pages and client components (no I/O). */

export const numberFormat = (digits = 0) =>
  new Intl.NumberFormat("en-GB", { maximumFractionDigits: digits, minimumFractionDigits: 0 });

/** A number with about `significant` significant digits (1.23, 12.3, 123). */
export function formatSig(value: number | null | undefined, significant = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  if (value === 0) return "0";
  // Tiny p- and q-values: "7.6e-7" says more than "0".
  if (Math.abs(value) < 0.001) return value.toExponential(1);
  const digits = Math.max(0, significant - 1 - Math.floor(Math.log10(Math.abs(value))));
  return numberFormat(Math.min(digits, 4)).format(value);
}

/** "2.9–5.6" or "1.2–∞" for an interval. */
export function formatInterval(lower: number | null, upper: number | null): string {
  return `${formatSig(lower)}–${upper === null || !Number.isFinite(upper) ? "∞" : formatSig(upper)}`;
}

/** A band "25,000–50,000 mi" in the organisation's unit (bands are stored in miles). */
export function formatBand(fromMi: number, toMi: number, unit: "mi" | "km"): string {
  const f = numberFormat(0);
  return `${f.format(milesToUnit(fromMi, unit))}–${f.format(milesToUnit(toMi, unit))} ${unit}`;
}

/** A short band label for axes: "25k–50k". */
export function formatBandShort(fromMi: number, toMi: number, unit: "mi" | "km"): string {
  const k = (mi: number) => `${Math.round(milesToUnit(mi, unit) / 1000)}k`;
  return `${k(fromMi)}–${k(toMi)}`;
}

/** Money from integer cents, in the organisation's own currency (no symbol is assumed). */
export function formatMoney(cents: number): string {
  return new Intl.NumberFormat("en-GB", {
    minimumFractionDigits: 2,
    maximumFractionDigits: 2,
  }).format(cents / 100);
}

/** A rate per 10,000 mi converted to per 10,000 of the organisation's unit. */
export function ratePerTenThousand(ratePer10kMi: number | null, unit: "mi" | "km"): number | null {
  if (ratePer10kMi === null) return null;
  return unit === "km" ? ratePer10kMi / 1.609344 : ratePer10kMi;
}
