import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { formatDistance } from "@/lib/units";
import { loadVehicle } from "./load-vehicle";

export const metadata: Metadata = { title: "Vehicle" };

export default async function VehiclePage({ params }: { params: Promise<{ id: string }> }) {
  const { auth, vehicle } = await loadVehicle((await params).id);
  if (!vehicle) notFound();
  const unit = auth.organisation.distanceUnit;
  const facts: [string, React.ReactNode][] = [
    ["VIN", vehicle.vin ? <span className="font-mono">{vehicle.vin}</span> : "—"],
    ["Unit number", vehicle.unitNumber ?? "—"],
    ["Generation", vehicle.generation ?? "not in catalogue"],
    ["Engine", vehicle.engine ?? "—"],
    ["Transmission", vehicle.transmission ?? "—"],
    ["In service since", vehicle.inServiceDate ?? "—"],
    [
      "Last odometer",
      vehicle.lastOdometerMi === null
        ? "—"
        : `${formatDistance(vehicle.lastOdometerMi, unit)} on ${vehicle.lastOdometerOn ?? "?"}`,
    ],
  ];
  return (
    <>
      <PageHeader
        title={`${vehicle.modelYear} ${vehicle.make} ${vehicle.model}`}
        description={vehicle.unitNumber ? `Unit ${vehicle.unitNumber}` : (vehicle.vin ?? undefined)}
        actions={<Link href="/vehicles">← All vehicles</Link>}
      />
      <div className="grid gap-4 lg:grid-cols-3">
        <Panel title="Vehicle">
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            {facts.map(([k, v]) => (
              <div key={k} className="contents">
                <dt className="text-ink-soft">{k}</dt>
                <dd>{v}</dd>
              </div>
            ))}
          </dl>
        </Panel>
        <Panel title="Records" className="lg:col-span-2">
          <ul className="flex flex-wrap gap-6 text-sm">
            <li>
              <span className="text-2xl font-semibold tabular-nums">
                {vehicle.counts.repairOrders}
              </span>{" "}
              repair orders
            </li>
            <li>
              <span className="text-2xl font-semibold tabular-nums">
                {vehicle.counts.faultEvents}
              </span>{" "}
              fault-code events
            </li>
            <li>
              <span className="text-2xl font-semibold tabular-nums">{vehicle.counts.fillUps}</span>{" "}
              fill-ups
            </li>
          </ul>
          <p className="mt-3 text-sm text-ink-soft">
            The full timeline of repairs, fault events and fill-ups on one mileage axis arrives with
            the pattern explorer.
          </p>
        </Panel>
      </div>
      <Panel title="Latest repair lines" className="mt-4">
        {vehicle.recentRepairs.length === 0 ? (
          <p className="text-sm text-ink-soft">No repairs recorded.</p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <thead className="text-ink-soft">
                <tr>
                  <th className="py-1 pr-3 font-medium">RO</th>
                  <th className="py-1 pr-3 font-medium">Opened</th>
                  <th className="py-1 pr-3 text-right font-medium">Odometer</th>
                  <th className="py-1 pr-3 font-medium">Complaint</th>
                  <th className="py-1 pr-3 font-medium">Correction</th>
                  <th className="py-1 font-medium">DTCs</th>
                </tr>
              </thead>
              <tbody>
                {vehicle.recentRepairs.map((r) => (
                  <tr key={r.id} className="border-t border-line/60 align-top">
                    <td className="py-1.5 pr-3 font-mono text-[13px]">{r.roNumber}</td>
                    <td className="py-1.5 pr-3 whitespace-nowrap">{r.openedOn}</td>
                    <td className="py-1.5 pr-3 text-right tabular-nums">
                      {r.odometerMi === null ? "—" : formatDistance(r.odometerMi, unit)}
                    </td>
                    <td className="py-1.5 pr-3">{r.complaint ?? "—"}</td>
                    <td className="py-1.5 pr-3">{r.correction ?? "—"}</td>
                    <td className="py-1.5 font-mono text-[13px]">{r.dtcCodes ?? ""}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Panel>
    </>
  );
}
