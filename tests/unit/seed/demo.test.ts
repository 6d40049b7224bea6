import { createHash } from "node:crypto";
import { rmSync } from "node:fs";
import type { Client } from "@libsql/client";
import { sql, type SQL } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openDatabase, type Db } from "@/db";
import { migrateDatabase } from "@/db/migrate";
import { components, dtcCodes, memberships, organisations, users } from "@/db/schema";
import {
  DEMO_ACCOUNTS,
  DEMO_END,
  DEMO_PASSWORD,
  DEMO_START,
  loadDemo,
  type DemoSummary,
} from "@/db/seed/demo";
import { COMPONENTS } from "@/db/seed/reference";
import { verifyPassword } from "@/lib/auth/password";
import { checkVin } from "@/lib/vin";
import { createTestDatabaseUrl } from "../../support/test-db";

/**
 * The demo loader against real file databases: volumes, integrity, determinism, idempotence,
 * and that each planted pattern shows up in a plain SQL query.
 */

type Handle = { dir: string; client: Client; db: Db; stop: () => Promise<void> };
const handles: Handle[] = [];

async function openFreshDatabase(): Promise<Handle> {
  const { url, dir, stop } = await createTestDatabaseUrl();
  const { client, db } = await openDatabase(url);
  await migrateDatabase(db);
  const handle = { dir, client, db, stop };
  handles.push(handle);
  return handle;
}

async function queryRows<T>(db: Db, query: SQL): Promise<T[]> {
  return db.all<T>(query);
}

async function queryNumber(db: Db, query: SQL): Promise<number> {
  const [row] = await db.all<{ n: number | null }>(query);
  return Number(row?.n ?? 0);
}

/** Id-free digests of the generated records, so databases loaded at different times compare. */
async function digestDemo(db: Db): Promise<string> {
  const hash = createHash("sha256");
  const queries = [
    sql`select g.slug, v.vin, v.unit_number, v.make, v.model, v.model_year, v.engine, v.transmission,
          v.in_service_date, v.last_odometer_mi, v.last_odometer_on, n.label, v.created_at
        from vehicles v join organisations g on g.id = v.organisation_id
        left join generations n on n.id = v.generation_id
        order by g.slug, v.vin`,
    sql`select g.slug, o.ro_number, v.vin, l.line_no, l.opened_on, l.odometer_mi, l.complaint, l.cause,
          l.correction, l.dtc_codes, c.slug as component, l.symptom, l.labor_hours, l.parts_cost_cents,
          l.labor_cost_cents, l.part_numbers, l.technician, l.vendor, l.is_warranty, o.closed_on
        from repair_lines l join repair_orders o on o.id = l.repair_order_id
        join vehicles v on v.id = l.vehicle_id join organisations g on g.id = l.organisation_id
        left join components c on c.id = l.component_id
        order by g.slug, o.ro_number, l.line_no`,
    sql`select g.slug, v.vin, e.occurred_at, e.odometer_mi, e.dtc, e.mil_on, e.status
        from fault_events e join vehicles v on v.id = e.vehicle_id join organisations g on g.id = e.organisation_id
        order by g.slug, v.vin, e.occurred_at, e.dtc, e.status`,
    sql`select g.slug, v.vin, f.filled_at, f.odometer_mi, f.volume_l, f.price_total_cents, f.station
        from fuel_transactions f join vehicles v on v.id = f.vehicle_id join organisations g on g.id = f.organisation_id
        order by g.slug, v.vin, f.filled_at`,
    sql`select g.slug, p.part_number, p.description, c.slug, p.on_hand, p.unit_cost_cents, p.lead_time_days
        from parts p join organisations g on g.id = p.organisation_id left join components c on c.id = p.component_id
        order by g.slug, p.part_number`,
  ];
  // In pages: a libSQL server caps one response (10 MB by default).
  const PAGE = 5_000;
  for (const query of queries) {
    for (let offset = 0; ; offset += PAGE) {
      const page = await db.all(sql`${query} limit ${PAGE} offset ${offset}`);
      hash.update(JSON.stringify(page));
      if (page.length < PAGE) break;
    }
  }
  return hash.digest("hex");
}

function countsOf(summary: DemoSummary, slug: string) {
  const counts = summary.organisations.find((o) => o.slug === slug);
  if (!counts) throw new Error(`no counts for ${slug}`);
  return counts;
}

/** Rate per 10,000 mi. */
function per10k(events: number, miles: number): number {
  return miles > 0 ? (events / miles) * 10000 : 0;
}

type VehicleTally = { cohort: string; lo: number; hi: number } & Record<string, number | string>;

/**
 * One row per vehicle of an organisation: its cohort ("Model Generation", or the model year when
 * no generation covers it), the odometer range its repair orders span, and the given sums over
 * its repair lines (l) and their components (c). Grouped queries, so the indexes on
 * (organisation_id, vehicle_id) do the work.
 */
async function listVehicleTallies(
  db: Db,
  organisationId: number,
  sums: SQL,
): Promise<VehicleTally[]> {
  return db.all<VehicleTally>(sql`
    with r as (select vehicle_id, min(odometer_mi) as lo, max(odometer_mi) as hi from repair_orders
               where organisation_id = ${organisationId} group by vehicle_id),
         e as (select l.vehicle_id, ${sums} from repair_lines l left join components c on c.id = l.component_id
               where l.organisation_id = ${organisationId} group by l.vehicle_id)
    select v.model || ' ' || coalesce(g.label, v.model_year) as cohort, r.lo, r.hi, e.*
    from vehicles v join r on r.vehicle_id = v.id left join e on e.vehicle_id = v.id
    left join generations g on g.id = v.generation_id
    where v.organisation_id = ${organisationId}`);
}

/** Sums a column over the tallies of the cohorts a predicate picks. */
function sumOf(
  rows: readonly VehicleTally[],
  pick: (cohort: string) => boolean,
  value: (r: VehicleTally) => number,
): number {
  return rows.filter((r) => pick(r.cohort)).reduce((s, r) => s + value(r), 0);
}

const count = (name: string) => (r: VehicleTally) => Number(r[name] ?? 0);
const milesOf = (r: VehicleTally) => r.hi - r.lo;
/** Miles a vehicle's readings span inside [from, to). */
const milesBetween = (from: number, to: number) => (r: VehicleTally) =>
  Math.max(0, Math.min(r.hi, to) - Math.max(r.lo, from));

let main: Handle;
let first: DemoSummary;
let orgIds: Record<string, number>;

beforeAll(async () => {
  main = await openFreshDatabase();
  first = await loadDemo(main.db);
  const rows = await main.db
    .select({ id: organisations.id, slug: organisations.slug })
    .from(organisations);
  orgIds = Object.fromEntries(rows.map((r) => [r.slug, r.id]));
}, 60_000);

afterAll(async () => {
  for (const h of handles) {
    h.client.close();
    await h.stop();
    rmSync(h.dir, { recursive: true, force: true });
  }
});

describe("loading the demo", () => {
  it("loads both organisations with volumes in the expected ranges, well under a minute", () => {
    expect(first.status).toBe("loaded");
    expect(first.millis).toBeLessThan(45_000);
    expect(first.users).toBe(DEMO_ACCOUNTS.length);
    const tidewater = countsOf(first, "tidewater");
    expect(tidewater.vehicles).toBeGreaterThanOrEqual(130);
    expect(tidewater.vehicles).toBeLessThanOrEqual(150);
    expect(tidewater.repairOrders).toBeGreaterThan(2500);
    expect(tidewater.repairLines).toBeGreaterThanOrEqual(tidewater.repairOrders);
    expect(tidewater.repairLines).toBeLessThanOrEqual(tidewater.repairOrders * 3);
    expect(tidewater.faultEvents).toBeGreaterThan(5000);
    expect(tidewater.fuelTransactions).toBeGreaterThan(20000);
    expect(tidewater.fuelTransactions).toBeLessThan(40000);
    expect(tidewater.generations).toBe(7);
    const northgate = countsOf(first, "northgate");
    expect(northgate.vehicles).toBe(2000);
    expect(northgate.repairOrders).toBeGreaterThan(10000);
    expect(northgate.repairLines).toBeLessThanOrEqual(northgate.repairOrders * 3);
    expect(northgate.fuelTransactions).toBe(0);
    expect(northgate.faultEvents).toBeGreaterThan(500);
    expect(northgate.parts).toBeGreaterThanOrEqual(80);
    expect(northgate.parts).toBeLessThanOrEqual(150);
    expect(northgate.generations).toBe(12);
  });

  it("sets up the organisations as a mile-reading demo fleet and shop", async () => {
    const rows = await main.db.select().from(organisations).orderBy(organisations.slug);
    expect(rows.map((o) => [o.slug, o.kind, o.distanceUnit, o.isDemo])).toEqual([
      ["northgate", "shop", "mi", true],
      ["tidewater", "fleet", "mi", true],
    ]);
    expect(await main.db.$count(components)).toBe(COMPONENTS.length);
    expect(await main.db.$count(dtcCodes)).toBeGreaterThanOrEqual(30);
  });

  it("creates the demo accounts with their roles, and the demo password works", async () => {
    const rows = await queryRows<{ email: string; slug: string; role: string }>(
      main.db,
      sql`select u.email, o.slug, m.role from ${memberships} m join ${users} u on u.id = m.user_id
          join ${organisations} o on o.id = m.organisation_id order by u.email, o.slug`,
    );
    const expected = DEMO_ACCOUNTS.flatMap((a) =>
      a.organisations.map((slug) => ({ email: a.email, slug, role: a.role })),
    ).sort((a, b) => a.email.localeCompare(b.email) || a.slug.localeCompare(b.slug));
    expect(rows).toEqual(expected);
    expect(rows.filter((r) => r.email === "admin@recurra.example").map((r) => r.slug)).toEqual([
      "northgate",
      "tidewater",
    ]);
    const [admin] = await main.db
      .select()
      .from(users)
      .where(sql`email = 'admin@recurra.example'`);
    expect(await verifyPassword(DEMO_PASSWORD, admin?.passwordHash ?? "")).toBe(true);
  });
});

describe("demo records", () => {
  it("gives every vehicle a unique synthetic VIN that decodes to its model year (49 CFR 565; 73 FR 23367)", async () => {
    const rows = await queryRows<{ vin: string; model_year: number }>(
      main.db,
      sql`select vin, model_year from vehicles`,
    );
    expect(rows.length).toBe(2144);
    expect(new Set(rows.map((r) => r.vin)).size).toBe(rows.length);
    for (const { vin, model_year } of rows) {
      const check = checkVin(vin);
      expect(check.hasValidCheckDigit, vin).toBe(true);
      expect(check.isPlaceholder, vin).toBe(false);
      expect(check.modelYear, vin).toBe(model_year);
      // Invented manufacturer identifiers only (see scenario.ts).
      expect(["0AU", "0BR", "0ST"]).toContain(check.wmi);
    }
  });

  it("matches generations by model year; only a few vehicles fall outside the catalogue", async () => {
    const mismatched = await queryNumber(
      main.db,
      sql`select count(*) as n from vehicles v join generations g on g.id = v.generation_id
          where g.organisation_id != v.organisation_id or g.make != v.make or g.model != v.model
             or v.model_year not between g.year_from and g.year_to`,
    );
    expect(mismatched).toBe(0);
    const missed = await queryNumber(
      main.db,
      sql`select count(*) as n from vehicles v where v.generation_id is null and exists (
            select 1 from generations g where g.organisation_id = v.organisation_id and g.make = v.make
              and g.model = v.model and v.model_year between g.year_from and g.year_to)`,
    );
    expect(missed).toBe(0);
    const uncovered = await queryNumber(
      main.db,
      sql`select count(*) as n from vehicles where generation_id is null`,
    );
    expect(uncovered).toBeGreaterThan(0);
    expect(uncovered).toBeLessThan(2144 * 0.05);
  });

  it("keeps every row with its own organisation", async () => {
    const leaks = await queryNumber(
      main.db,
      sql`select
          (select count(*) from repair_orders o join vehicles v on v.id = o.vehicle_id where o.organisation_id != v.organisation_id)
        + (select count(*) from repair_lines l join repair_orders o on o.id = l.repair_order_id
             where l.organisation_id != o.organisation_id or l.vehicle_id != o.vehicle_id)
        + (select count(*) from repair_line_codes c join repair_lines l on l.id = c.repair_line_id
             where c.organisation_id != l.organisation_id or c.vehicle_id != l.vehicle_id)
        + (select count(*) from fault_events e join vehicles v on v.id = e.vehicle_id where e.organisation_id != v.organisation_id)
        + (select count(*) from fuel_transactions f join vehicles v on v.id = f.vehicle_id where f.organisation_id != v.organisation_id)
        + (select count(*) from vehicles v join generations g on g.id = v.generation_id where g.organisation_id != v.organisation_id)
        as n`,
    );
    expect(leaks).toBe(0);
    const northgateFuel = await queryNumber(
      main.db,
      sql`select count(*) as n from fuel_transactions where organisation_id = ${orgIds.northgate}`,
    );
    expect(northgateFuel).toBe(0);
  });

  it("copies vehicle, date and odometer from each order onto its lines", async () => {
    const differing = await queryNumber(
      main.db,
      sql`select count(*) as n from repair_lines l join repair_orders o on o.id = l.repair_order_id
          where l.opened_on != o.opened_on or l.odometer_mi is not o.odometer_mi`,
    );
    expect(differing).toBe(0);
    const lineCounts = await queryRows<{ lines: number; n: number }>(
      main.db,
      sql`select lines, count(*) as n from (select count(*) as lines from repair_lines group by repair_order_id) group by lines`,
    );
    expect(lineCounts.map((r) => r.lines).sort()).toEqual([1, 2, 3]);
  });

  it("writes one repair_line_codes row per code in dtc_codes, all of them known generic codes", async () => {
    const rows = await queryRows<{ written: string | null; stored: string | null }>(
      main.db,
      sql`select l.dtc_codes as written,
            (select group_concat(dtc, ' ') from (select c.dtc from repair_line_codes c where c.repair_line_id = l.id order by c.id)) as stored
          from repair_lines l`,
    );
    const mismatched = rows.filter((r) => (r.written ?? "") !== (r.stored ?? ""));
    expect(mismatched).toEqual([]);
    expect(rows.filter((r) => r.written).length).toBeGreaterThan(1000);
    const unknown = await queryNumber(
      main.db,
      sql`select count(*) as n from (select dtc from repair_line_codes union select dtc from fault_events)
          where dtc not in (select code from dtc_codes where is_generic = 1)`,
    );
    expect(unknown).toBe(0);
  });

  it("stores money as integer cents", async () => {
    const notInteger = await queryNumber(
      main.db,
      sql`select
          (select count(*) from repair_lines where typeof(parts_cost_cents) != 'integer' or typeof(labor_cost_cents) != 'integer'
             or parts_cost_cents < 0 or labor_cost_cents <= 0)
        + (select count(*) from fuel_transactions where typeof(price_total_cents) != 'integer' or price_total_cents <= 0)
        + (select count(*) from parts where typeof(unit_cost_cents) != 'integer' or unit_cost_cents <= 0)
        as n`,
    );
    expect(notInteger).toBe(0);
  });

  it("keeps dates inside the demo period and the last odometer reading current", async () => {
    const [range] = await queryRows<{
      first: string;
      last: string;
      firstEvent: string;
      lastFill: string;
    }>(
      main.db,
      sql`select min(opened_on) as first, max(closed_on) as last,
            (select min(occurred_at) from fault_events) as firstEvent,
            (select max(filled_at) from fuel_transactions) as lastFill
          from repair_orders`,
    );
    expect((range?.first ?? "") >= DEMO_START).toBe(true);
    expect((range?.last ?? "9999") <= DEMO_END).toBe(true);
    expect((range?.firstEvent ?? "") >= DEMO_START).toBe(true);
    expect((range?.lastFill ?? "").slice(0, 10) <= DEMO_END).toBe(true);
    const stale = await queryNumber(
      main.db,
      sql`select count(*) as n from vehicles v
          join (select vehicle_id, max(opened_on) as last_on, max(odometer_mi) as last_mi from repair_orders
                group by organisation_id, vehicle_id) o on o.vehicle_id = v.id
          where v.last_odometer_on is null or v.last_odometer_on < o.last_on or v.last_odometer_mi < o.last_mi - 10`,
    );
    expect(stale).toBe(0);
  });

  it("gives fleet vehicles unit numbers and keeps most repairs ordinary", async () => {
    const units = await queryRows<{ unit_number: string | null }>(
      main.db,
      sql`select unit_number from vehicles where organisation_id = ${orgIds.tidewater}`,
    );
    expect(units.every((u) => /^TP-\d{4}$/.test(u.unit_number ?? ""))).toBe(true);
    const planted = await queryNumber(
      main.db,
      sql`select count(*) * 1.0 / (select count(*) from repair_lines) as n from repair_lines l
          join components c on c.id = l.component_id
          where c.slug in ('fuel-vapour/purge-valve', 'power-distribution/body-ground', 'power-distribution/main-fuse',
                           'steering/assist-sensor', 'power-distribution/harness')`,
    );
    expect(planted).toBeLessThan(0.05);
  });
});

describe("planted patterns", () => {
  /** Cohort label of each vehicle: "Model Generation", or the model year when none covers it. */
  const cohortSql = sql`v.model || ' ' || coalesce(g.label, v.model_year)`;

  /**
   * For readings (organisation_id, vehicle_id, odometer_mi) of a Tidewater source: how many
   * there are, and how many fall within 20 mi after the vehicle's last fill-up, for Kestrel K2
   * and for every other cohort. Readings with no fill-up in the 1,000 mi before are left out.
   */
  async function findPostRefuelShares(source: SQL) {
    const rows = await queryRows<{ cohort: string; n: number; afterFill: number }>(
      main.db,
      sql`select case when cohort = 'Kestrel K2' then 'K2' else 'other' end as cohort, count(*) as n,
            sum(case when odo - last_fill <= 20 then 1 else 0 end) as afterFill
          from (
            select ${cohortSql} as cohort, x.odometer_mi as odo,
              (select max(f.odometer_mi) from fuel_transactions f where f.organisation_id = x.organisation_id
                 and f.vehicle_id = x.vehicle_id and f.odometer_mi <= x.odometer_mi
                 and f.odometer_mi > x.odometer_mi - 1000) as last_fill
            from (${source}) x join vehicles v on v.id = x.vehicle_id left join generations g on g.id = v.generation_id
          ) where last_fill is not null group by 1`,
    );
    const shareOf = (cohort: string) => {
      const row = rows.find((r) => r.cohort === cohort);
      return { n: row?.n ?? 0, share: (row?.afterFill ?? 0) / (row?.n || 1) };
    };
    return { k2: shareOf("K2"), other: shareOf("other") };
  }

  it("Kestrel K2 stalls cluster within 20 mi after a fill-up; other cohorts' stalls do not (window: common practice)", async () => {
    const lines = await findPostRefuelShares(
      sql`select organisation_id, vehicle_id, odometer_mi from repair_lines
          where organisation_id = ${orgIds.tidewater} and symptom = 'stall'`,
    );
    expect(lines.k2.n).toBeGreaterThanOrEqual(30);
    expect(lines.other.n).toBeGreaterThanOrEqual(10);
    // By chance about 20 / 325 ≈ 6% of stalls fall within 20 mi of the last fill-up.
    expect(lines.k2.share).toBeGreaterThan(0.5);
    expect(lines.other.share).toBeLessThan(0.2);
    // Telematics repeats an active code every driving day; count each occurrence once by
    // leaving out reports of the same code on the same vehicle in the 7 days before.
    const events = await findPostRefuelShares(
      sql`select e.organisation_id, e.vehicle_id, e.odometer_mi from fault_events e
          where e.organisation_id = ${orgIds.tidewater} and e.dtc in ('P0496', 'P0441') and e.status = 'confirmed'
            and not exists (select 1 from fault_events p where p.organisation_id = e.organisation_id
              and p.vehicle_id = e.vehicle_id and p.dtc = e.dtc and p.status = 'confirmed'
              and p.occurred_at < e.occurred_at
              and p.occurred_at >= strftime('%Y-%m-%dT%H:%M:%fZ', e.occurred_at, '-7 days'))`,
    );
    expect(events.k2.n).toBeGreaterThanOrEqual(30);
    expect(events.k2.share).toBeGreaterThan(0.7);
    expect(events.other.share).toBeLessThan(0.3);
  });

  it("Kestrel K2 purge-valve stalls include comebacks within 30 days", async () => {
    const comebacks = await queryNumber(
      main.db,
      sql`select count(*) as n from repair_lines a join repair_lines b
            on b.vehicle_id = a.vehicle_id and b.symptom = 'stall' and b.id != a.id
           and julianday(b.opened_on) - julianday(a.opened_on) between 0 and 30 and b.odometer_mi > a.odometer_mi
          join vehicles v on v.id = a.vehicle_id join generations g on g.id = v.generation_id
          where a.organisation_id = ${orgIds.tidewater} and a.symptom = 'stall' and g.label = 'K2'`,
    );
    expect(comebacks).toBeGreaterThanOrEqual(5);
  });

  it("Merlin M2 shift complaints per mile rise sharply past 75,000 mi", async () => {
    const rows = await listVehicleTallies(
      main.db,
      orgIds.tidewater as number,
      sql`sum(case when l.symptom = 'shift-quality' and l.odometer_mi < 75000 then 1 else 0 end) as below,
          sum(case when l.symptom = 'shift-quality' and l.odometer_mi >= 75000 then 1 else 0 end) as above`,
    );
    const isM2 = (c: string) => c === "Merlin M2";
    const isRest = (c: string) => !isM2(c);
    const below = milesBetween(0, 75000);
    const above = milesBetween(75000, Infinity);
    const m2Above = sumOf(rows, isM2, count("above"));
    expect(m2Above).toBeGreaterThanOrEqual(30);
    expect(sumOf(rows, isM2, below)).toBeGreaterThan(200000);
    const m2AboveRate = per10k(m2Above, sumOf(rows, isM2, above));
    expect(m2AboveRate).toBeGreaterThan(
      3 * per10k(sumOf(rows, isM2, count("below")), sumOf(rows, isM2, below)),
    );
    expect(m2AboveRate).toBeGreaterThan(
      4 * per10k(sumOf(rows, isRest, count("above")), sumOf(rows, isRest, above)),
    );
  });

  it("Kestrel K3 has intermittent no-starts well above the rest, traced to the main fuse", async () => {
    const rows = await listVehicleTallies(
      main.db,
      orgIds.tidewater as number,
      sql`sum(case when l.symptom = 'no-start' then 1 else 0 end) as noStarts,
          sum(case when c.slug = 'power-distribution/main-fuse' then 1 else 0 end) as mainFuse`,
    );
    const isK3 = (c: string) => c === "Kestrel K3";
    const isRest = (c: string) => !isK3(c);
    const k3NoStarts = sumOf(rows, isK3, count("noStarts"));
    expect(k3NoStarts).toBeGreaterThanOrEqual(30);
    const restRate = per10k(sumOf(rows, isRest, count("noStarts")), sumOf(rows, isRest, milesOf));
    expect(per10k(k3NoStarts, sumOf(rows, isK3, milesOf))).toBeGreaterThan(2.5 * restRate);
    expect(sumOf(rows, isK3, count("mainFuse"))).toBeGreaterThan(
      3 * sumOf(rows, isRest, count("mainFuse")),
    );
  });

  it("Brindle Skua SK3 loses steering assist mostly between 50,000 and 75,000 mi (Northgate)", async () => {
    const rows = await listVehicleTallies(
      main.db,
      orgIds.northgate as number,
      sql`sum(case when l.symptom = 'steering-assist-loss' and l.odometer_mi >= 50000 and l.odometer_mi < 75000
                   then 1 else 0 end) as inBand,
          sum(case when l.symptom = 'steering-assist-loss' and (l.odometer_mi < 50000 or l.odometer_mi >= 75000)
                   then 1 else 0 end) as outBand`,
    );
    const isSk3 = (c: string) => c === "Skua SK3";
    const isRest = (c: string) => !isSk3(c);
    const band = milesBetween(50000, 75000);
    const sk3InBand = sumOf(rows, isSk3, count("inBand"));
    expect(sk3InBand).toBeGreaterThanOrEqual(15);
    const sk3Rate = per10k(sk3InBand, sumOf(rows, isSk3, band));
    const restRate = per10k(sumOf(rows, isRest, count("inBand")), sumOf(rows, isRest, band));
    const outside = sumOf(rows, isSk3, milesOf) - sumOf(rows, isSk3, band);
    expect(sk3Rate).toBeGreaterThan(4 * restRate);
    expect(sk3Rate).toBeGreaterThan(3 * per10k(sumOf(rows, isSk3, count("outBand")), outside));
  });

  it("Ostra Wren W2 keeps blowing accessory fuses, with repeat visits (Northgate)", async () => {
    const rows = await listVehicleTallies(
      main.db,
      orgIds.northgate as number,
      sql`sum(case when l.symptom = 'electrical-accessory' then 1 else 0 end) as events`,
    );
    const isW2 = (c: string) => c === "Wren W2";
    const isRest = (c: string) => !isW2(c);
    const w2Events = sumOf(rows, isW2, count("events"));
    expect(w2Events).toBeGreaterThanOrEqual(40);
    const restRate = per10k(sumOf(rows, isRest, count("events")), sumOf(rows, isRest, milesOf));
    expect(per10k(w2Events, sumOf(rows, isW2, milesOf))).toBeGreaterThan(2.5 * restRate);
    expect(sumOf(rows, isW2, (r) => (count("events")(r) >= 2 ? 1 : 0))).toBeGreaterThanOrEqual(10);
  });
});

describe("determinism and reloading", () => {
  it("refuses to replace an organisation that holds a demo slug but is not a demo", async () => {
    const other = await openFreshDatabase();
    await other.db.insert(organisations).values({ slug: "northgate", name: "A real shop" });
    await expect(loadDemo(other.db, { reset: true })).rejects.toThrow(/not a demo/);
    const rows = await other.db.select({ name: organisations.name }).from(organisations);
    expect(rows).toEqual([{ name: "A real shop" }]);
  });

  it("gives byte-identical records for the same seed and different ones for another seed", async () => {
    const again = await openFreshDatabase();
    const other = await openFreshDatabase();
    const [summaryAgain, summaryOther] = await Promise.all([
      loadDemo(again.db),
      loadDemo(other.db, { seed: 7 }),
    ]);
    expect(summaryAgain.organisations).toEqual(first.organisations);
    const digest = await digestDemo(main.db);
    expect(await digestDemo(again.db)).toBe(digest);
    expect(summaryOther.status).toBe("loaded");
    expect(await digestDemo(other.db)).not.toBe(digest);
    // Two whole demo loads: on a libSQL server each takes half a minute on a slow machine.
  }, 180_000);

  it("does nothing on a second load, and reset reloads the same data without duplicating accounts", async () => {
    const before = await digestDemo(main.db);
    const second = await loadDemo(main.db);
    expect(second.status).toBe("already-loaded");
    expect(second.organisations).toEqual(first.organisations);
    const messages: string[] = [];
    const reset = await loadDemo(main.db, { reset: true, log: (m) => messages.push(m) });
    expect(reset.status).toBe("loaded");
    expect(reset.organisations).toEqual(first.organisations);
    expect(messages.some((m) => m.includes("deleting"))).toBe(true);
    expect(await digestDemo(main.db)).toBe(before);
    expect(await main.db.$count(users)).toBe(DEMO_ACCOUNTS.length);
    expect(await main.db.$count(memberships)).toBe(
      DEMO_ACCOUNTS.reduce((n, a) => n + a.organisations.length, 0),
    );
    expect(await main.db.$count(organisations)).toBe(2);
  }, 120_000);
});
