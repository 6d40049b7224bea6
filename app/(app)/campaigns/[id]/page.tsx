import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { DoneToggle } from "@/components/campaigns/forms";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { getDb } from "@/db";
import { getCampaign } from "@/db/queries/campaigns";
import { requirePage } from "@/lib/auth/guard";
import { formatDistance } from "@/lib/units";

export const metadata: Metadata = { title: "Campaign" };

const Id = z.coerce.number().int().positive();

export default async function CampaignPage({ params }: { params: Promise<{ id: string }> }) {
  const auth = await requirePage("campaigns:manage");
  const id = Id.safeParse((await params).id);
  if (!id.success) notFound();
  const campaign = await getCampaign(await getDb(), auth, id.data);
  if (!campaign) notFound();
  const done = campaign.vehicles.filter((v) => v.doneAt).length;
  return (
    <>
      <PageHeader
        title={campaign.name}
        description={`${done} of ${campaign.vehicles.length} vehicles done`}
        actions={<Link href="/at-risk">← Vehicles at risk</Link>}
      />
      <Panel>
        <table className="w-full text-left text-sm">
          <caption className="sr-only">Vehicles on this list</caption>
          <thead className="text-ink-soft">
            <tr>
              <th scope="col" className="py-1 pr-3 font-medium">
                Vehicle
              </th>
              <th scope="col" className="py-1 pr-3 font-medium">
                Model
              </th>
              <th scope="col" className="py-1 pr-3 font-medium">
                Odometer
              </th>
              <th scope="col" className="py-1 pr-3 font-medium">
                Done
              </th>
              <th scope="col" className="py-1 font-medium">
                <span className="sr-only">Change</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {campaign.vehicles.map((v) => {
              const name = v.unitNumber ?? v.vin ?? `#${v.vehicleId}`;
              return (
                <tr key={v.id} className="border-t border-line/60">
                  <td className="py-1 pr-3">
                    <Link href={`/vehicles/${v.vehicleId}`}>{name}</Link>
                  </td>
                  <td className="py-1 pr-3">
                    {v.make} {v.model}
                  </td>
                  <td className="py-1 pr-3 tabular-nums">
                    {v.lastOdometerMi === null
                      ? "—"
                      : formatDistance(v.lastOdometerMi, auth.organisation.distanceUnit)}
                  </td>
                  <td className="py-1 pr-3" data-testid="campaign-done">
                    {v.doneAt
                      ? `done ${v.doneAt.slice(0, 10)}${v.doneBy ? ` by ${v.doneBy}` : ""}`
                      : "not done"}
                  </td>
                  <td className="py-1">
                    <DoneToggle
                      campaignId={campaign.id}
                      campaignVehicleId={v.id}
                      isDone={Boolean(v.doneAt)}
                      label={name}
                    />
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </Panel>
    </>
  );
}
