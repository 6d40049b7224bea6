import { sql } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { getFixHeld, getKnownIssueFixHeld } from "@/db/queries/fix-held";
import { changeKnownIssueState, getKnownIssue, listKnownIssues } from "@/db/queries/known-issues";
import { getLookup, recordFinding } from "@/db/queries/lookup";
import { ForbiddenError, NotFoundError, type OrgScope } from "@/db/queries/scope";
import { findOrganisationBySlug } from "@/db/queries/system";
import { loadDemo } from "@/db/seed/demo";
import { recomputeOrganisation } from "@/jobs/recompute/recompute";
import { FindingForm } from "@/lib/known-issues";
import { createTestDb } from "../../support/test-db";

let db: Db;
const scope: Record<string, OrgScope> = {};
let purgeId: number;
/** A Northgate Aurel Kestrel K2 that had the purge valve replaced, with its VIN and odometer. */
let k2: { id: number; vin: string; odometer: number };
let tidewaterVehicle: { vin: string; unit: string };

async function userId(email: string): Promise<number> {
  const [u] = await db.all<{ id: number }>(sql`select id from users where email = ${email}`);
  return Number(u?.id);
}

beforeAll(async () => {
  ({ db } = await createTestDb());
  await loadDemo(db);
  const north = await findOrganisationBySlug(db, "northgate");
  const tide = await findOrganisationBySlug(db, "tidewater");
  await recomputeOrganisation(db, north.id);
  scope.technician = {
    organisationId: north.id,
    userId: await userId("technician@recurra.example"),
    role: "technician",
  };
  scope.shopManager = {
    organisationId: north.id,
    userId: await userId("shop-manager@recurra.example"),
    role: "manager",
  };
  scope.viewer = { organisationId: north.id, userId: null, role: "viewer" };
  scope.tidewater = {
    organisationId: tide.id,
    userId: await userId("manager@recurra.example"),
    role: "manager",
  };
  const [v] = await db.all<{ id: number; vin: string; last_odometer_mi: number }>(sql`
    select v.id, v.vin, v.last_odometer_mi from vehicles v join generations g on g.id = v.generation_id
     where v.organisation_id = ${north.id} and v.make = 'Aurel' and v.model = 'Kestrel' and g.label = 'K2'
       and v.vin is not null and v.last_odometer_mi is not null
       and exists (select 1 from repair_lines l join components k on k.id = l.component_id
                    where l.vehicle_id = v.id and k.slug = 'fuel-vapour/purge-valve')
     order by v.id limit 1`);
  k2 = { id: Number(v!.id), vin: v!.vin, odometer: Math.round(Number(v!.last_odometer_mi)) };
  const [t] = await db.all<{ vin: string; unit_number: string }>(sql`
    select vin, unit_number from vehicles where organisation_id = ${tide.id} and vin is not null
       and unit_number is not null order by id limit 1`);
  tidewaterVehicle = { vin: t!.vin, unit: t!.unit_number };
  const issues = await listKnownIssues(db, scope.shopManager);
  purgeId = issues.find((k) => k.title.startsWith("Stalls just after refuelling"))!.id;
}, 120_000);

describe("the lookup on the demo", () => {
  test("a Kestrel K2 with P0496 at its odometer: the purge-valve known issue ranks first", async () => {
    const r = await getLookup(db, scope.technician!, {
      vin: k2.vin.toLowerCase(),
      odometer: k2.odometer,
      codes: ["P0496"],
      symptom: null,
    });
    expect(r.found).toBe(true);
    if (!r.found) return;
    expect(r.cohort).toBe("Aurel Kestrel K2");
    expect(r.band!.fromMi).toBeLessThanOrEqual(k2.odometer);
    expect(r.band!.toMi).toBeGreaterThan(k2.odometer);
    const first = r.causes[0]!;
    expect(first.knownIssue?.id).toBe(purgeId);
    expect(first.checks.length).toBeGreaterThanOrEqual(3);
    expect(first.cautions.map((c) => c.kind)).toContain("fuel-vapour");
    expect(first.share.trials).toBe(r.matchedLines);
    expect(first.share.successes).toBeGreaterThan(first.share.trials / 2);
    expect(first.fixHeld!.fixes).toBeGreaterThan(0);
    // The known issue absorbs the purge-valve cell: the fault is not listed twice.
    expect(r.causes.filter((c) => c.component?.slug === "fuel-vapour/purge-valve")).toHaveLength(1);
    // Ranked by the Wilson lower bound, best first.
    const lows = r.causes.map((c) => c.share.lower ?? -1);
    expect([...lows].sort((a, b) => b - a)).toEqual(lows);
    // Independent count of what the share says: P0496 lines of the cohort (band or widened).
    const [n] = await db.all<{ n: number; fixed: number }>(sql`
      select count(*) as n, sum(k.slug = 'fuel-vapour/purge-valve') as fixed
        from repair_lines l join vehicles v on v.id = l.vehicle_id
        join generations g on g.id = v.generation_id left join components k on k.id = l.component_id
       where l.organisation_id = ${scope.technician!.organisationId} and v.model = 'Kestrel' and g.label = 'K2'
         and exists (select 1 from repair_line_codes c where c.repair_line_id = l.id and c.dtc = 'P0496')
         ${r.isWidened ? sql`` : sql`and l.odometer_mi >= ${r.band!.fromMi} and l.odometer_mi < ${r.band!.toMi}`}`);
    expect(first.share.fromLines).toEqual({ fixed: Number(n!.fixed), of: Number(n!.n) });
  });

  test("how often the fix held: the lookup shows the known issue's own figure, as its page does", async () => {
    const r = await getLookup(db, scope.technician!, {
      vin: k2.vin,
      odometer: k2.odometer,
      codes: ["P0496"],
      symptom: null,
    });
    if (!r.found) throw new Error("the K2 is on file");
    const inLookup = r.causes.find((c) => c.knownIssue?.id === purgeId)!.fixHeld!;
    // The known issue's page reads its figure with getKnownIssueFixHeld.
    const detail = (await getKnownIssue(db, scope.shopManager!, purgeId))!;
    const onPage = (await getKnownIssueFixHeld(db, scope.shopManager!, detail))!;
    expect({ held: inLookup.held, fixes: inLookup.fixes }).toEqual({
      held: onPage.held,
      fixes: onPage.fixes,
    });
    expect(inLookup).toEqual(onPage);
    // An independent count of the repairs: failure lines of the purge valve or of the issue's
    // codes in its cohorts, one per vehicle and day.
    const cohorts = sql.join(
      detail.cohorts.map((c) =>
        c.generationId === null
          ? sql`(v.make = ${c.make} and v.model = ${c.model})`
          : sql`(v.make = ${c.make} and v.model = ${c.model} and v.generation_id = ${c.generationId})`,
      ),
      sql` or `,
    );
    const [n] = await db.all<{ n: number }>(sql`
      select count(distinct l.vehicle_id || '|' || l.opened_on) as n
        from repair_lines l join vehicles v on v.id = l.vehicle_id
        left join components k on k.id = l.component_id
       where l.organisation_id = ${scope.technician!.organisationId} and l.kind = 'failure'
         and (${cohorts})
         and (k.slug = ${detail.component!.slug} or exists (select 1 from repair_line_codes c
              where c.repair_line_id = l.id and c.dtc in (${sql.join(
                detail.dtcCodes.map((d) => sql`${d}`),
                sql`, `,
              )})))`);
    // Every repair is counted once: its window passed (fixes) or not yet (stillOpen).
    expect(onPage.fixes + onPage.stillOpen).toBe(Number(n!.n));
    expect(onPage.held).toBe(onPage.fixes - onPage.comebacks);
    expect(onPage.held).toBeLessThan(onPage.fixes);
    // A computed pattern: the same definition over the vehicle's cohort.
    const pattern = r.causes.find((c) => c.kind === "cell" && c.fixHeld !== null);
    if (pattern) {
      const own = await getFixHeld(db, scope.technician!, {
        cohorts: [{ make: "Aurel", model: "Kestrel", generationId: r.vehicle.generationId }],
        fault: { component: pattern.component!.slug, dtcs: [] },
      });
      expect(pattern.fixHeld).toEqual(own);
    }
  });

  test("a VIN not in the organisation is not found (and nothing is ranked)", async () => {
    const r = await getLookup(db, scope.technician!, {
      vin: "1M8GDM9AXKP042788", // 49 CFR 565 worked example (trade-facts.md); not a demo vehicle
      codes: [],
      symptom: null,
    });
    expect(r.found).toBe(false);
    expect(r.vehicle).toBeNull();
  });

  test("another organisation's vehicle is not found, by VIN or unit number", async () => {
    const byVin = await getLookup(db, scope.technician!, {
      vin: tidewaterVehicle.vin,
      codes: [],
      symptom: null,
    });
    const byUnit = await getLookup(db, scope.technician!, {
      unit: tidewaterVehicle.unit,
      codes: [],
      symptom: null,
    });
    expect([byVin.found, byUnit.found]).toEqual([false, false]);
    // Its own organisation finds it.
    const own = await getLookup(db, scope.tidewater!, {
      unit: tidewaterVehicle.unit,
      codes: [],
      symptom: null,
    });
    expect(own.found).toBe(true);
  });

  test("a vehicle not on file, by make, model and year, gets its cohort's ranking", async () => {
    const [k] = await db.all<{ model_year: number }>(
      sql`select model_year from vehicles where id = ${k2.id}`,
    );
    const onFile = await getLookup(db, scope.technician!, {
      vin: k2.vin,
      odometer: k2.odometer,
      codes: ["P0496"],
      symptom: null,
    });
    // The same cohort typed in other case, with a VIN that is nobody's (49 CFR 565 worked
    // example, trade-facts.md) and the same odometer: the same cohort, band and causes.
    const walkIn = await getLookup(db, scope.technician!, {
      vin: "1M8GDM9AXKP042788",
      walkIn: { make: "aurel", model: "KESTREL", year: Number(k!.model_year) },
      odometer: k2.odometer,
      codes: ["P0496"],
      symptom: null,
    });
    expect(onFile.found && walkIn.found).toBe(true);
    if (!onFile.found || !walkIn.found) return;
    expect(walkIn.vehicle.id).toBeNull();
    expect(onFile.vehicle.id).not.toBeNull();
    expect(walkIn.vehicle.id).toBeNull();
    expect(walkIn.vehicle.vin).toBe("1M8GDM9AXKP042788");
    expect(walkIn.cohort).toBe("Aurel Kestrel K2");
    expect(walkIn.band).toEqual(onFile.band);
    expect(walkIn.matchedLines).toBe(onFile.matchedLines);
    const summary = (r: typeof walkIn) =>
      r.causes.map((c) => [c.key, c.share.successes, c.share.trials]);
    expect(summary(walkIn)).toEqual(summary(onFile));
    expect(walkIn.causes[0]?.knownIssue?.id).toBe(purgeId);
    // With no odometer there is no reading on record to fall back on: no band.
    const noOdometer = await getLookup(db, scope.technician!, {
      walkIn: { make: "Aurel", model: "Kestrel", year: Number(k!.model_year) },
      codes: [],
      symptom: null,
    });
    expect(noOdometer.found && noOdometer.band).toBeNull();
  });

  test("a make and model nobody has is said so; a year no generation covers counts by year", async () => {
    const unknown = await getLookup(db, scope.technician!, {
      walkIn: { make: "Zephyrine", model: "Quill", year: 2020 },
      codes: [],
      symptom: null,
    });
    expect(unknown.found).toBe(false);
    expect(!unknown.found && unknown.reason).toBe("unknown-model");
    // A VIN that names nobody, without make and model, is "not on file" as before.
    const notOnFile = await getLookup(db, scope.technician!, {
      vin: "1M8GDM9AXKP042788",
      codes: [],
      symptom: null,
    });
    expect(!notOnFile.found && notOnFile.reason).toBe("not-on-file");
    const outside = await getLookup(db, scope.technician!, {
      walkIn: { make: "AUREL", model: "kestrel", year: 1981 },
      codes: [],
      symptom: null,
    });
    expect(outside.found).toBe(true);
    if (!outside.found) return;
    expect(outside.vehicle).toMatchObject({ make: "Aurel", model: "Kestrel", generation: null });
    expect(outside.cohort).toBe("Aurel Kestrel 1981");
    expect(outside.matchedLines).toBe(0);
  });

  test("a walk-in counts only the organisation's own records", async () => {
    const [k] = await db.all<{ model_year: number }>(
      sql`select model_year from vehicles where id = ${k2.id}`,
    );
    const walkIn = { make: "Aurel", model: "Kestrel", year: Number(k!.model_year) };
    const [north, tide] = await Promise.all(
      [scope.technician!, scope.tidewater!].map((s) =>
        getLookup(db, s, { walkIn, codes: [], symptom: null }),
      ),
    );
    expect(north!.found && tide!.found).toBe(true);
    if (!north!.found || !tide!.found) return;
    // No odometer: no band, so every failure line of the cohort counts (never scheduled
    // service or wear). An independent count per organisation, over its own vehicles of that
    // cohort (generation, else model year).
    const cohortLines = async (org: number, generationId: number | null) => {
      const [n] = await db.all<{ n: number }>(sql`
        select count(*) as n from repair_lines l join vehicles v on v.id = l.vehicle_id
         where l.organisation_id = ${org} and v.organisation_id = ${org} and l.kind = 'failure'
           and v.make = 'Aurel' and v.model = 'Kestrel'
           and ${generationId === null ? sql`v.generation_id is null and v.model_year = ${walkIn.year}` : sql`v.generation_id = ${generationId}`}`);
      return Number(n!.n);
    };
    const northCount = await cohortLines(
      scope.technician!.organisationId,
      north!.vehicle.generationId,
    );
    const tideCount = await cohortLines(
      scope.tidewater!.organisationId,
      tide!.vehicle.generationId,
    );
    expect(north!.band).toBeNull();
    expect(north!.matchedLines).toBe(northCount);
    expect(tide!.matchedLines).toBe(tideCount);
    expect(northCount).toBeGreaterThan(0);
    expect(tideCount).not.toBe(northCount);
  });

  test("without codes, no cause is scheduled service or wear (oil and filter, lamps, pads were ranked first before kinds)", async () => {
    const tech = scope.technician!;
    const vehicles = await db.all<{ vin: string }>(sql`
      select vin from vehicles where organisation_id = ${tech.organisationId}
         and vin is not null and last_odometer_mi is not null order by id limit 5`);
    const [service] = await db.all<{ slugs: string }>(sql`
      select group_concat(slug, ' ') as slugs from components where kind in ('service', 'wear')`);
    const notFailures = new Set(String(service!.slugs).split(" "));
    for (const v of vehicles) {
      const result = await getLookup(db, tech, { vin: v.vin, codes: [], symptom: null });
      if (!result.found) continue;
      for (const c of result.causes)
        expect(notFailures.has(c.component?.slug ?? ""), `${v.vin}: ${c.title}`).toBe(false);
    }
  });

  test("a viewer may not look up", async () => {
    await expect(
      getLookup(db, scope.viewer!, { vin: k2.vin, codes: [], symptom: null }),
    ).rejects.toBeInstanceOf(ForbiddenError);
  });
});

describe("recording a finding", () => {
  const form = (extra: Record<string, unknown> = {}) =>
    FindingForm.parse({
      vehicleId: String(k2.id),
      knownIssueId: String(purgeId),
      outcome: "confirmed",
      odometer: String(k2.odometer + 10),
      dtcCodes: "P0496 p0441",
      symptom: "stall",
      ...extra,
    });

  test("writes the finding, the repair order, line and codes, the audit entry and a recompute", async () => {
    const [jobsBefore] = await db.all<{ n: number }>(
      sql`select count(*) as n from jobs where kind = 'recompute' and organisation_id = ${scope.technician!.organisationId}`,
    );
    const r = await recordFinding(db, scope.technician!, form());
    expect(r.roNumber).toBe(`F-${r.findingId}`);
    expect(r.emailed).toBe(0); // the known issue is only being watched
    const [finding] = await db.all<Record<string, unknown>>(
      sql`select * from known_issue_findings where id = ${r.findingId}`,
    );
    expect(finding).toMatchObject({
      known_issue_id: purgeId,
      vehicle_id: k2.id,
      outcome: "confirmed",
      repair_line_id: r.repairLineId,
      user_id: scope.technician!.userId,
    });
    const [line] = await db.all<Record<string, unknown>>(sql`
      select o.ro_number, o.opened_on, o.odometer_mi, l.vehicle_id, l.complaint, l.symptom, l.dtc_codes,
             k.slug as component, l.cause
        from repair_lines l join repair_orders o on o.id = l.repair_order_id
        left join components k on k.id = l.component_id where l.id = ${r.repairLineId}`);
    expect(line).toMatchObject({
      ro_number: r.roNumber,
      opened_on: new Date().toISOString().slice(0, 10),
      odometer_mi: k2.odometer + 10,
      vehicle_id: k2.id,
      complaint: "Stall",
      symptom: "stall",
      dtc_codes: "P0496 P0441",
      component: "fuel-vapour/purge-valve",
    });
    const codes = await db.all<{ dtc: string }>(
      sql`select dtc from repair_line_codes where repair_line_id = ${r.repairLineId} order by dtc`,
    );
    expect(codes.map((c) => c.dtc)).toEqual(["P0441", "P0496"]);
    const audit = await db.all<{ action: string; user_id: number }>(
      sql`select action, user_id from audit_log where entity = 'known_issue_finding' and entity_id = ${String(r.findingId)}`,
    );
    expect(audit).toEqual([{ action: "finding.record", user_id: scope.technician!.userId }]);
    const [jobsAfter] = await db.all<{ n: number }>(
      sql`select count(*) as n from jobs where kind = 'recompute' and organisation_id = ${scope.technician!.organisationId} and status = 'queued'`,
    );
    expect(Number(jobsAfter!.n)).toBe(Number(jobsBefore!.n) + 1);

    // The lookup now counts the finding as a finding, not its line as a repair line too.
    const after = await getLookup(db, scope.technician!, {
      vin: k2.vin,
      odometer: k2.odometer,
      codes: ["P0496"],
      symptom: null,
    });
    if (!after.found) throw new Error("not found");
    const purge = after.causes.find((c) => c.knownIssue?.id === purgeId)!;
    expect(purge.share.fromFindings.confirmed).toBeGreaterThanOrEqual(1);
    expect(purge.share.trials).toBe(
      purge.share.fromLines.of +
        purge.share.fromFindings.confirmed +
        purge.share.fromFindings.notTheCause,
    );
  });

  test("not the cause: no component on the line; something else: the technician's words", async () => {
    const no = await recordFinding(db, scope.technician!, form({ outcome: "not-the-cause" }));
    const [l1] = await db.all<{ component_id: number | null; cause: string }>(
      sql`select component_id, cause from repair_lines where id = ${no.repairLineId}`,
    );
    expect(l1).toMatchObject({
      component_id: null,
      cause: expect.stringMatching(/^Not the cause/),
    });
    const other = await recordFinding(
      db,
      scope.technician!,
      FindingForm.parse({
        vehicleId: String(k2.id),
        outcome: "something-else",
        cause: "Vacuum hose split at the intake",
        correction: "Replaced the hose",
      }),
    );
    const [l2] = await db.all<{ cause: string; correction: string }>(
      sql`select cause, correction from repair_lines where id = ${other.repairLineId}`,
    );
    expect(l2).toEqual({
      cause: "Vacuum hose split at the intake",
      correction: "Replaced the hose",
    });
    expect(
      FindingForm.safeParse({ vehicleId: "1", outcome: "something-else" }).error?.issues[0]?.path,
    ).toEqual(["cause"]);
    expect(
      FindingForm.safeParse({
        vehicleId: "1",
        outcome: "confirmed",
        knownIssueId: "1",
        dtcCodes: "Q123",
      }).error?.issues[0]?.message,
    ).toMatch(/SAE J2012/);
  });

  test("a computed pattern's component as the cause: the line is fixed at it, no known issue", async () => {
    const r = await recordFinding(
      db,
      scope.technician!,
      FindingForm.parse({
        vehicleId: String(k2.id),
        outcome: "something-else",
        componentSlug: "fuel-vapour/filler-cap",
        cause: "Fuel vapour → Filler cap and neck",
        correction: "Replaced filler cap",
        dtcCodes: "P0455",
      }),
    );
    const [line] = await db.all<Record<string, unknown>>(sql`
      select k.slug as component, l.cause, l.correction, f.known_issue_id, f.outcome
        from repair_lines l left join components k on k.id = l.component_id
        join known_issue_findings f on f.repair_line_id = l.id
       where l.id = ${r.repairLineId}`);
    expect(line).toEqual({
      component: "fuel-vapour/filler-cap",
      cause: "Fuel vapour → Filler cap and neck",
      correction: "Replaced filler cap",
      known_issue_id: null,
      outcome: "something-else",
    });
    const [audit] = await db.all<{ detail: string }>(
      sql`select detail from audit_log where entity = 'known_issue_finding' and entity_id = ${String(r.findingId)}`,
    );
    expect(JSON.parse(audit!.detail)).toMatchObject({ componentSlug: "fuel-vapour/filler-cap" });
    // A component that does not exist is refused, and nothing is written.
    const [before] = await db.all<{ n: number }>(
      sql`select count(*) as n from known_issue_findings`,
    );
    await expect(
      recordFinding(
        db,
        scope.technician!,
        FindingForm.parse({
          vehicleId: String(k2.id),
          outcome: "something-else",
          componentSlug: "no-such/part",
          cause: "x",
        }),
      ),
    ).rejects.toBeInstanceOf(NotFoundError);
    const [after] = await db.all<{ n: number }>(
      sql`select count(*) as n from known_issue_findings`,
    );
    expect(Number(after!.n)).toBe(Number(before!.n));
    // A component goes only with a cause that is not a known issue.
    expect(
      FindingForm.safeParse({
        vehicleId: "1",
        outcome: "confirmed",
        knownIssueId: "1",
        componentSlug: "fuel-vapour/filler-cap",
      }).error?.issues[0]?.path,
    ).toEqual(["componentSlug"]);
  });

  test("once the known issue is confirmed, a confirmed finding e-mails its watchers", async () => {
    await changeKnownIssueState(db, scope.shopManager!, {
      knownIssueId: purgeId,
      toState: "confirmed",
      reason: "Found it the cause again and again.",
    });
    const r = await recordFinding(db, scope.technician!, form());
    const mail = await db.all<{ to_address: string; text_body: string }>(sql`
      select to_address, text_body from email_outbox
       where subject = 'A vehicle matched a confirmed known issue: Stalls just after refuelling: purge valve sticking open'
       order by to_address`);
    // The demo's watchers of this issue at Northgate (db/seed/demo/known-issues.ts).
    expect(mail.map((m) => m.to_address)).toEqual([
      "admin@recurra.example",
      "shop-manager@recurra.example",
    ]);
    expect(r.emailed).toBe(2);
    expect(mail[0]!.text_body).toContain(r.roNumber);
    // "Not the cause" on a confirmed issue sends nothing.
    await recordFinding(db, scope.technician!, form({ outcome: "not-the-cause" }));
    const [n] = await db.all<{ n: number }>(
      sql`select count(*) as n from email_outbox where subject like 'A vehicle matched%'`,
    );
    expect(Number(n!.n)).toBe(2);
  });

  test("a viewer and another organisation are refused, and nothing is written", async () => {
    const [before] = await db.all<{ n: number }>(
      sql`select count(*) as n from known_issue_findings`,
    );
    await expect(recordFinding(db, scope.viewer!, form())).rejects.toBeInstanceOf(ForbiddenError);
    // Tidewater's manager: the Northgate vehicle is not theirs.
    await expect(recordFinding(db, scope.tidewater!, form())).rejects.toBeInstanceOf(NotFoundError);
    // Nor is Northgate's known issue, even on a Tidewater vehicle.
    const [tv] = await db.all<{ id: number }>(
      sql`select id from vehicles where organisation_id = ${scope.tidewater!.organisationId} limit 1`,
    );
    await expect(
      recordFinding(db, scope.tidewater!, form({ vehicleId: String(tv!.id) })),
    ).rejects.toBeInstanceOf(NotFoundError);
    const [after] = await db.all<{ n: number }>(
      sql`select count(*) as n from known_issue_findings`,
    );
    expect(after!.n).toBe(before!.n);
  });

  test("a retired known issue is not offered; its cell then stands on its own", async () => {
    await changeKnownIssueState(db, scope.shopManager!, {
      knownIssueId: purgeId,
      toState: "retired",
      reason: "Testing retirement.",
    });
    const r = await getLookup(db, scope.technician!, {
      vin: k2.vin,
      odometer: k2.odometer,
      codes: ["P0496"],
      symptom: null,
    });
    if (!r.found) throw new Error("not found");
    expect(r.causes.some((c) => c.knownIssue?.id === purgeId)).toBe(false);
    const cell = r.causes.find((c) => c.component?.slug === "fuel-vapour/purge-valve");
    if (cell) {
      expect(cell.kind).toBe("cell");
      expect(cell.cautions.map((c) => c.kind)).toEqual(["fuel-vapour"]); // cautionsForComponent
    }
  });
});
