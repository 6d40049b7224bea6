import type { Metadata } from "next";
import Link from "next/link";
import { z } from "zod";
import { AddVehicleForm } from "@/components/vehicles/add-vehicle-form";
import { PageHeader } from "@/components/ui/page-header";
import { SearchForm } from "@/components/ui/search-form";
import { Pagination } from "@/components/ui/pagination";
import { getDb } from "@/db";
import { listVehicles } from "@/db/queries/vehicles";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/roles";
import { formatDistance } from "@/lib/units";
import { queryValues, type PageSearchParams } from "@/lib/search-params";

export const metadata: Metadata = { title: "Vehicles" };

const Query = z.object({
  q: z.string().trim().max(100).optional().catch(undefined),
  page: z.coerce.number().int().min(1).max(100_000).catch(1).default(1),
});

const PAGE_SIZE = 50;

export default async function VehiclesPage({ searchParams }: { searchParams: PageSearchParams }) {
  const auth = await requirePage("vehicles:read");
  const { q, page } = Query.parse(await queryValues(searchParams));
  const { rows, total } = await listVehicles(await getDb(), auth, { q, page, pageSize: PAGE_SIZE });
  const unit = auth.organisation.distanceUnit;
  return (
    <>
      <PageHeader
        title="Vehicles"
        description={`${total.toLocaleString("en-GB")} vehicle${total === 1 ? "" : "s"}${q ? ` matching “${q}”` : ""} in ${auth.organisation.name}.`}
      />
      <SearchForm
        action="/vehicles"
        label="Search vehicles"
        placeholder="VIN, unit number, make or model"
        defaultValue={q}
      />
      <div className="overflow-x-auto rounded-lg border border-line bg-panel">
        <table className="w-full text-left text-sm">
          <thead className="border-b border-line bg-paper text-ink-soft">
            <tr>
              <th className="px-3 py-2 font-medium">Unit</th>
              <th className="px-3 py-2 font-medium">VIN</th>
              <th className="px-3 py-2 font-medium">Vehicle</th>
              <th className="px-3 py-2 font-medium">Generation</th>
              <th className="px-3 py-2 text-right font-medium">Last odometer</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((v) => (
              <tr key={v.id} className="border-b border-line/60 last:border-0 hover:bg-sea-50">
                <td className="px-3 py-2">
                  <Link href={`/vehicles/${v.id}`}>{v.unitNumber ?? "—"}</Link>
                </td>
                <td className="px-3 py-2 font-mono text-[13px]">
                  <Link href={`/vehicles/${v.id}`}>{v.vin ?? "—"}</Link>
                </td>
                <td className="px-3 py-2">
                  {v.modelYear} {v.make} {v.model}
                </td>
                <td className="px-3 py-2">
                  {v.generation ?? <span className="text-ink-soft">not in catalogue</span>}
                </td>
                <td className="px-3 py-2 text-right tabular-nums">
                  {v.lastOdometerMi === null ? "—" : formatDistance(v.lastOdometerMi, unit)}
                </td>
              </tr>
            ))}
            {rows.length === 0 ? (
              <tr>
                <td colSpan={5} className="px-3 py-6 text-center text-ink-soft">
                  {q ? "No vehicle matches this search." : "No vehicles yet."}
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
      <Pagination
        page={page}
        pageSize={PAGE_SIZE}
        total={total}
        basePath="/vehicles"
        params={{ q }}
      />
      {can(auth.role, "vehicles:write") ? <AddVehicleForm /> : null}
    </>
  );
}
