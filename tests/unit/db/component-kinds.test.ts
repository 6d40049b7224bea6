import { sql } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import {
  getComponentKind,
  listComponentKinds,
  setComponentKind,
} from "@/db/queries/component-kinds";
import { ForbiddenError, NotFoundError, type OrgScope } from "@/db/queries/scope";
import { importText, setUpOrganisation } from "../../support/import-helpers";
import { createTestDb } from "../../support/test-db";

let db: Db;
let fleet: OrgScope;
let other: OrgScope;
const admin = (s: OrgScope): OrgScope => ({ ...s, role: "admin" });

// Four lines on U-1: an oil service, pads, a purge valve repair, and coils replaced by schedule.
const REPAIRS = `ro_number,unit_number,opened_on,odometer,complaint,correction,component,dtc_codes
RO-1,U-1,2025-01-10,10000,,Changed oil and filter,Oil and filter,
RO-2,U-1,2025-02-10,12000,Squeal when braking,Fitted new front pads,Front pads,
RO-3,U-1,2025-03-10,14000,Stalls after refuelling,Replaced purge valve,Purge valve,P0496
RO-4,U-1,2025-04-10,16000,,Replaced ignition coils per interval,Ignition coils,
RO-5,U-1,2025-05-10,18000,Misfire under load,Replaced ignition coils,Ignition coils,P0300
`;

async function linesOf(scope: OrgScope) {
  return db.all<{ ro_number: string; kind: string; is_scheduled: number }>(sql`
    select o.ro_number, l.kind, l.is_scheduled from repair_lines l
      join repair_orders o on o.id = l.repair_order_id
     where l.organisation_id = ${scope.organisationId} order by o.ro_number`);
}

beforeAll(async () => {
  ({ db } = await createTestDb());
  fleet = await setUpOrganisation(db, "kinds-fleet");
  other = await setUpOrganisation(db, "kinds-other");
  for (const scope of [fleet, other]) {
    const { result } = await importText(db, scope, "repairs", REPAIRS);
    expect(result.status).toBe("done");
  }
});

describe("component kinds (service, wear, failure)", () => {
  test("an import classifies each line from its component and its words", async () => {
    expect(await linesOf(fleet)).toEqual([
      { ro_number: "RO-1", kind: "service", is_scheduled: 1 },
      { ro_number: "RO-2", kind: "wear", is_scheduled: 0 },
      { ro_number: "RO-3", kind: "failure", is_scheduled: 0 },
      // A failure component replaced by the schedule, with no complaint, is service.
      { ro_number: "RO-4", kind: "service", is_scheduled: 1 },
      { ro_number: "RO-5", kind: "failure", is_scheduled: 0 },
    ]);
  });

  test("the list gives every component its kind and Recurra's default", async () => {
    const list = await listComponentKinds(db, fleet);
    const oil = list.find((c) => c.slug === "engine-mechanical/oil-service");
    expect(oil).toMatchObject({ kind: "service", defaultKind: "service" });
    expect(list.find((c) => c.slug === "brakes/front-pads")?.kind).toBe("wear");
  });

  test("an admin's change classifies the organisation's lines again, is audited and queues a recompute; other organisations keep theirs", async () => {
    await expect(setComponentKind(db, fleet, "ignition/coils", "wear")).rejects.toBeInstanceOf(
      ForbiddenError,
    );
    const jobsBefore = await db.all<{ n: number }>(
      sql`select count(*) as n from jobs where organisation_id = ${fleet.organisationId} and kind = 'recompute'`,
    );
    const result = await setComponentKind(db, admin(fleet), "ignition/coils", "wear");
    expect(result).toMatchObject({ isChanged: true, linesChanged: 2 });
    expect(await linesOf(fleet)).toContainEqual({
      ro_number: "RO-4",
      kind: "wear",
      is_scheduled: 1,
    });
    expect(await linesOf(fleet)).toContainEqual({
      ro_number: "RO-5",
      kind: "wear",
      is_scheduled: 0,
    });
    expect(await linesOf(other)).toContainEqual({
      ro_number: "RO-5",
      kind: "failure",
      is_scheduled: 0,
    });
    const [audit] = await db.all<{ action: string; entity_id: string; detail: string }>(sql`
      select action, entity_id, detail from audit_log
       where organisation_id = ${fleet.organisationId} and action = 'component.kind'`);
    expect(audit).toMatchObject({ entity_id: "ignition/coils" });
    expect(JSON.parse(audit!.detail)).toEqual({ from: "failure", to: "wear", lines: 2 });
    const jobsAfter = await db.all<{ n: number }>(
      sql`select count(*) as n from jobs where organisation_id = ${fleet.organisationId} and kind = 'recompute'`,
    );
    expect(Number(jobsAfter[0]!.n)).toBe(Number(jobsBefore[0]!.n) + 1);
    expect(
      (await listComponentKinds(db, other)).find((c) => c.slug === "ignition/coils")?.kind,
    ).toBe("failure");

    // Back to Recurra's default: the organisation's own kind is removed; scheduled lines stay service.
    await setComponentKind(db, admin(fleet), "ignition/coils", "failure");
    expect(await linesOf(fleet)).toContainEqual({
      ro_number: "RO-4",
      kind: "service",
      is_scheduled: 1,
    });
    expect(await linesOf(fleet)).toContainEqual({
      ro_number: "RO-5",
      kind: "failure",
      is_scheduled: 0,
    });
    const own = await db.all<{ n: number }>(
      sql`select count(*) as n from component_kinds where organisation_id = ${fleet.organisationId}`,
    );
    expect(Number(own[0]!.n)).toBe(0);
  });

  test("the same kind again changes nothing; an unknown component is not found", async () => {
    const again = await setComponentKind(db, admin(fleet), "brakes/front-pads", "wear");
    expect(again).toMatchObject({ isChanged: false, linesChanged: 0 });
    await expect(setComponentKind(db, admin(fleet), "no/such", "wear")).rejects.toBeInstanceOf(
      NotFoundError,
    );
  });

  test("a finding's line takes its component's kind for the organisation", async () => {
    const [pads] = await db.all<{ id: number }>(
      sql`select id from components where slug = 'brakes/front-pads'`,
    );
    expect(await getComponentKind(db, fleet, pads!.id)).toBe("wear");
  });
});
