import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import type { Db } from "@/db";
import { campaigns, campaignVehicles, users, vehicles } from "@/db/schema";
import { recordAudit } from "./audit";
import { assertCan, ConflictError, inOrg, NotFoundError, orgWhere, type OrgScope } from "./scope";

/** Campaign lists of the organisation, newest first, with how many vehicles are done. */
export async function listCampaigns(db: Db, scope: OrgScope) {
  assertCan(scope, "campaigns:manage");
  return db
    .select({
      id: campaigns.id,
      name: campaigns.name,
      createdAt: campaigns.createdAt,
      vehicles: sql<number>`(select count(*) from campaign_vehicles cv where cv.campaign_id = campaigns.id)`,
      done: sql<number>`(select count(*) from campaign_vehicles cv where cv.campaign_id = campaigns.id and cv.done_at is not null)`,
    })
    .from(campaigns)
    .where(orgWhere(campaigns, scope))
    .orderBy(desc(campaigns.createdAt), desc(campaigns.id));
}

export async function getCampaign(db: Db, scope: OrgScope, id: number) {
  assertCan(scope, "campaigns:manage");
  const [campaign] = await db
    .select()
    .from(campaigns)
    .where(orgWhere(campaigns, scope, eq(campaigns.id, id)))
    .limit(1);
  if (!campaign) return null;
  const list = await db
    .select({
      id: campaignVehicles.id,
      vehicleId: campaignVehicles.vehicleId,
      unitNumber: vehicles.unitNumber,
      vin: vehicles.vin,
      make: vehicles.make,
      model: vehicles.model,
      lastOdometerMi: vehicles.lastOdometerMi,
      doneAt: campaignVehicles.doneAt,
      doneBy: users.name,
    })
    .from(campaignVehicles)
    .innerJoin(vehicles, eq(vehicles.id, campaignVehicles.vehicleId))
    .leftJoin(users, eq(users.id, campaignVehicles.doneBy))
    .where(orgWhere(campaignVehicles, scope, eq(campaignVehicles.campaignId, id)))
    .orderBy(asc(vehicles.unitNumber), asc(vehicles.id));
  return { ...campaign, vehicles: list };
}

/**
 * Adds vehicles to a campaign list: an existing one (by id) or a new one (by name). Vehicles
 * already on the list stay as they are; vehicles of another organisation are refused.
 */
export async function addToCampaign(
  db: Db,
  scope: OrgScope,
  input: { campaignId?: number; name?: string; knownIssueId?: number; vehicleIds: number[] },
) {
  assertCan(scope, "campaigns:manage");
  return db.transaction(async (tx) => {
    let campaignId = input.campaignId;
    if (campaignId !== undefined) {
      const [found] = await tx
        .select({ id: campaigns.id })
        .from(campaigns)
        .where(orgWhere(campaigns, scope, eq(campaigns.id, campaignId)));
      if (!found) throw new NotFoundError("No such campaign in this organisation.");
    } else {
      if (!input.name) throw new ConflictError("Name the new campaign.");
      const [exists] = await tx
        .select({ id: campaigns.id })
        .from(campaigns)
        .where(orgWhere(campaigns, scope, eq(campaigns.name, input.name)));
      if (exists) throw new ConflictError(`A campaign called "${input.name}" already exists.`);
      const [created] = await tx
        .insert(campaigns)
        .values(
          inOrg(scope, {
            name: input.name,
            knownIssueId: input.knownIssueId ?? null,
            createdBy: scope.userId,
          }),
        )
        .returning({ id: campaigns.id });
      campaignId = created!.id;
    }
    const ids = [...new Set(input.vehicleIds)];
    const owned = await tx
      .select({ id: vehicles.id })
      .from(vehicles)
      .where(orgWhere(vehicles, scope, inArray(vehicles.id, ids)));
    if (owned.length !== ids.length) {
      throw new NotFoundError("A chosen vehicle is not in this organisation.");
    }
    const added = await tx
      .insert(campaignVehicles)
      .values(ids.map((vehicleId) => inOrg(scope, { campaignId: campaignId!, vehicleId })))
      .onConflictDoNothing()
      .returning({ id: campaignVehicles.id });
    await recordAudit(tx, scope, {
      action: "campaign.add",
      entity: "campaign",
      entityId: campaignId,
      detail: { vehicles: added.length },
    });
    return { campaignId: campaignId!, added: added.length };
  });
}

/** Marks one vehicle of a campaign done (or not done again). */
export async function setCampaignVehicleDone(
  db: Db,
  scope: OrgScope,
  input: { campaignVehicleId: number; done: boolean },
) {
  assertCan(scope, "campaigns:manage");
  await db.transaction(async (tx) => {
    const updated = await tx
      .update(campaignVehicles)
      .set(
        input.done
          ? { doneAt: sql`strftime('%Y-%m-%dT%H:%M:%fZ', 'now')`, doneBy: scope.userId }
          : { doneAt: null, doneBy: null },
      )
      .where(
        orgWhere(campaignVehicles, scope, and(eq(campaignVehicles.id, input.campaignVehicleId))),
      )
      .returning({ campaignId: campaignVehicles.campaignId });
    if (updated.length === 0) throw new NotFoundError("No such vehicle on a campaign here.");
    await recordAudit(tx, scope, {
      action: input.done ? "campaign.done" : "campaign.undone",
      entity: "campaign",
      entityId: updated[0]!.campaignId,
      detail: { campaignVehicleId: input.campaignVehicleId },
    });
  });
}
