import "server-only";
import { sql } from "drizzle-orm";
import type { Db } from "@/db";
import { analyseComebacks, type ComebackLine } from "@/lib/comeback-rates";
import { unitToMiles } from "@/lib/units";
import { assertCan, type OrgScope } from "./scope";

/**
 * Comebacks of the organisation: every repair line with its codes, component, technician and
 * vendor (the line's, else the order's), grouped by lib/comeback-rates.ts with the
 * organisation's comeback window (comebackDays, comebackDistance in its unit) and its
 * confidence level; DTCs named with their descriptions.
 */
/** Repair lines per query page. */
const PAGE = 5_000;

export async function getComebackReport(db: Db, scope: OrgScope) {
  assertCan(scope, "comebacks:read");
  const [org] = await db.all<{
    comeback_days: number;
    comeback_distance: number;
    distance_unit: "mi" | "km";
    confidence_level: number;
    as_of: string | null;
  }>(sql`
    select o.comeback_days, o.comeback_distance, o.distance_unit, o.confidence_level,
           (select max(opened_on) from visible_repair_lines where organisation_id = ${scope.organisationId}) as as_of
      from organisations o where o.id = ${scope.organisationId}`);
  if (!org) throw new Error("getComebackReport: organisation missing");
  // Paged by id: one response stays well under a libSQL server's response limit (10 MB).
  type Row = {
    id: number;
    repair_order_id: number;
    ro_number: string;
    vehicle_id: number;
    opened_on: string;
    odometer_mi: number | null;
    codes: string | null;
    slug: string | null;
    system: string | null;
    name: string | null;
    complaint: string | null;
    cause: string | null;
    correction: string | null;
    technician: string | null;
    vendor: string | null;
  };
  const rows: Row[] = [];
  for (let after = 0; ;) {
    const page = await db.all<Row>(sql`
    select rl.id, rl.repair_order_id, ro.ro_number, rl.vehicle_id, rl.opened_on,
           coalesce(rl.odometer_mi, ro.odometer_mi) as odometer_mi,
           (select group_concat(c.dtc, ' ') from visible_repair_line_codes c
             where c.repair_line_id = rl.id and c.organisation_id = ${scope.organisationId}) as codes,
           k.slug, k.system, k.name, rl.complaint, rl.cause, rl.correction, rl.technician,
           coalesce(rl.vendor, ro.vendor) as vendor
      from visible_repair_lines rl
      join visible_repair_orders ro on ro.id = rl.repair_order_id and ro.organisation_id = ${scope.organisationId}
      left join components k on k.id = rl.component_id
     where rl.organisation_id = ${scope.organisationId} and rl.kind = 'failure' and rl.id > ${after}
     order by rl.id limit ${PAGE}`);
    rows.push(...page);
    if (page.length < PAGE) break;
    after = Number(page[page.length - 1]!.id);
  }
  const lines: ComebackLine[] = rows.map((r) => ({
    id: Number(r.id),
    repairOrderId: Number(r.repair_order_id),
    roNumber: r.ro_number,
    vehicleId: Number(r.vehicle_id),
    openedOn: r.opened_on,
    odometerMi: r.odometer_mi === null ? null : Number(r.odometer_mi),
    dtcs: r.codes ? r.codes.split(" ").filter(Boolean) : [],
    component: r.slug ? { slug: r.slug, system: r.system ?? "", name: r.name ?? "" } : null,
    complaint: r.complaint,
    cause: r.cause,
    correction: r.correction,
    technician: r.technician,
    vendor: r.vendor,
  }));
  // The descriptions of the organisation's repair-line codes, for the fault names.
  const descriptions = await db.all<{ code: string; description: string }>(sql`
    select distinct d.code, d.description
      from visible_repair_line_codes c join dtc_codes d on d.code = c.dtc
     where c.organisation_id = ${scope.organisationId}`);
  const window = {
    days: Number(org.comeback_days),
    miles: unitToMiles(Number(org.comeback_distance), org.distance_unit),
  };
  const confidence = Number(org.confidence_level);
  return {
    ...analyseComebacks(lines, window, org.as_of, {
      confidence,
      dtcDescriptions: new Map(descriptions.map((d) => [d.code, d.description])),
    }),
    settings: {
      days: Number(org.comeback_days),
      distance: Number(org.comeback_distance),
      unit: org.distance_unit,
      /** The level of every rate's interval. */
      confidence,
    },
  };
}

export type ComebackReport = Awaited<ReturnType<typeof getComebackReport>>;
