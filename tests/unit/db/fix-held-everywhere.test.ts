import { sql } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { getComebackReport } from "@/db/queries/comebacks";
import { getFixHeld, getKnownIssueFixHeld } from "@/db/queries/fix-held";
import { createKnownIssue, getKnownIssue } from "@/db/queries/known-issues";
import type { OrgScope } from "@/db/queries/scope";
import { findOrganisationBySlug } from "@/db/queries/system";
import { loadDemo } from "@/db/seed/demo";
import { buildDigest } from "@/jobs/digest/digest";
import { KnownIssueForm } from "@/lib/known-issues";
import { createTestDb } from "../../support/test-db";

// "How often the fix held" has one definition (lib/fix-held.ts). Where two screens show it for
// the same thing, the numbers are the same: a known issue naming one component in every cohort
// of the organisation, the comebacks screen's row for that component, and the digest's line.
// The definition itself (Recurra's rule, common practice for comebacks) is checked in
// tests/unit/lib/fix-held.test.ts; here only that every screen reads it.

let db: Db;
let manager: OrgScope;
let orgId: number;

beforeAll(async () => {
  ({ db } = await createTestDb());
  await loadDemo(db);
  orgId = (await findOrganisationBySlug(db, "northgate")).id;
  const [u] = await db.all<{ id: number }>(
    sql`select id from users where email = 'shop-manager@recurra.example'`,
  );
  manager = { organisationId: orgId, userId: Number(u!.id), role: "manager" };
}, 120_000);

describe("how often the fix held, the same on every screen", () => {
  test("known issue = comebacks screen = digest, for one component across the organisation", async () => {
    const report = await getComebackReport(db, manager);
    // The newest comeback with a component: its fault is in the digest from that day on.
    const pair = report.pairs.find((p) => p.again.component !== null && p.first.component);
    expect(pair).toBeDefined();
    const slug = pair!.again.component!.slug;
    const row = report.byFault.find((r) => r.key === `component:${slug}`)!;
    expect(row.comebacks).toBeGreaterThan(0);

    // The data layer's figure for the whole organisation.
    const whole = (await getFixHeld(db, manager, {
      cohorts: "all",
      fault: { component: slug, dtcs: [] },
    }))!;
    expect({ repairs: row.repairs, comebacks: row.comebacks }).toEqual({
      repairs: whole.fixes,
      comebacks: whole.comebacks,
    });
    expect(row.rate).toBeCloseTo(1 - whole.estimate, 12);
    // Wilson's interval is symmetric under complement (Wilson 1927): came back = 1 − held.
    expect(row.lower).toBeCloseTo(1 - whole.upper, 12);
    expect(row.upper).toBeCloseTo(1 - whole.lower, 12);

    // A known issue of that component in every cohort of the organisation: its page's figure.
    const models = await db.all<{ make: string; model: string }>(sql`
      select distinct make, model from vehicles where organisation_id = ${orgId}`);
    const form = KnownIssueForm.parse({
      title: "Every model, one component",
      componentSlug: slug,
      ...Object.fromEntries(models.map((m) => [`cohort:${m.make}|${m.model}|*`, "on"])),
    });
    const { id } = await createKnownIssue(db, manager, form);
    const detail = (await getKnownIssue(db, manager, id))!;
    const onPage = await getKnownIssueFixHeld(db, manager, detail);
    expect(onPage).toEqual(whole);

    // The digest from the day of that comeback's return: the same figure beside the fault.
    const digest = await buildDigest(db, orgId, new Date(`${pair!.again.openedOn}T00:00:00Z`));
    const line = digest.comebacks.find((c) => c.fault.endsWith(`→ ${pair!.again.component!.name}`));
    expect(line).toBeDefined();
    expect(line!.fixHeld).toEqual(whole);

    // And an independent count of the repairs: failure lines of the component, one per vehicle
    // and day, with the window passed (more than its days before the latest repair on record).
    const [n] = await db.all<{ passed: number; open: number }>(sql`
      with latest as (select max(opened_on) as d from repair_lines where organisation_id = ${orgId}),
           visits as (
             select distinct l.vehicle_id, l.opened_on from repair_lines l
               join components k on k.id = l.component_id
              where l.organisation_id = ${orgId} and l.kind = 'failure' and k.slug = ${slug})
      select sum(opened_on <= date((select d from latest), ${`-${whole.window.days} days`})) as passed,
             sum(opened_on > date((select d from latest), ${`-${whole.window.days} days`})) as open
        from visits`);
    expect(whole.fixes).toBe(Number(n!.passed));
    expect(whole.stillOpen).toBe(Number(n!.open));
  });
});
