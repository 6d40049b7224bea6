import { VehicleLink } from "@/components/vehicles/vehicle-link";
import { formatDistance } from "@/lib/units";

/** Vehicles as small links (names only for roles that may not open them). */
export function IssueVehicles({
  vehicles,
  unit,
  canOpen,
}: {
  vehicles: {
    id: number;
    unitNumber: string | null;
    vin: string | null;
    lastOdometerMi: number | null;
  }[];
  unit: "mi" | "km";
  canOpen: boolean;
}) {
  if (vehicles.length === 0) return <p className="text-sm text-ink-soft">None.</p>;
  return (
    <ul className="flex flex-wrap gap-2 text-sm">
      {vehicles.map((v) => (
        <li key={v.id}>
          <VehicleLink
            id={v.id}
            canOpen={canOpen}
            className="rounded border border-line px-2 py-1 no-underline hover:bg-sea-50"
          >
            {v.unitNumber ?? v.vin ?? `#${v.id}`}
            {v.lastOdometerMi !== null ? ` · ${formatDistance(v.lastOdometerMi, unit)}` : ""}
          </VehicleLink>
        </li>
      ))}
    </ul>
  );
}
