import "server-only";
import { desc } from "drizzle-orm";
import type { Db } from "@/db";
import {
  imports,
  vehicles,
  visibleFaultEvents,
  visibleFuelTransactions,
  visibleRepairOrders,
} from "@/db/schema";
import { assertCan, countRows, orgWhere, type OrgScope } from "./scope";

export type Overview = {
  vehicles: number;
  repairOrders: number;
  faultEvents: number;
  fillUps: number;
  lastImport: { fileName: string; kind: string; status: string; createdAt: string } | null;
};

/** Headline figures for the home page, all from the caller's organisation. */
export async function getOverview(db: Db, scope: OrgScope): Promise<Overview> {
  assertCan(scope, "dashboard:read");
  const [v, ro, fe, fu, last] = await Promise.all([
    countRows(db, vehicles, orgWhere(vehicles, scope)),
    countRows(db, visibleRepairOrders, orgWhere(visibleRepairOrders, scope)),
    countRows(db, visibleFaultEvents, orgWhere(visibleFaultEvents, scope)),
    countRows(db, visibleFuelTransactions, orgWhere(visibleFuelTransactions, scope)),
    db
      .select({
        fileName: imports.fileName,
        kind: imports.kind,
        status: imports.status,
        createdAt: imports.createdAt,
      })
      .from(imports)
      .where(orgWhere(imports, scope))
      .orderBy(desc(imports.id))
      .limit(1),
  ]);
  return {
    vehicles: v,
    repairOrders: ro,
    faultEvents: fe,
    fillUps: fu,
    lastImport: last[0] ?? null,
  };
}
