import { sql } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import type { Db } from "@/db";
import { changeKnownIssueState, listKnownIssues } from "@/db/queries/known-issues";
import { setDigestOptIn } from "@/db/queries/preferences";
import { findOrganisationBySlug } from "@/db/queries/system";
import { repairLines, repairOrders } from "@/db/schema";
import { loadDemo } from "@/db/seed/demo";
import { buildDigest, isoWeekKey, renderDigest, sendDigest } from "@/jobs/digest/digest";
import { recomputeOrganisation } from "@/jobs/recompute/recompute";
import { describeOutlook } from "@/lib/plain-words";
import { createTestDb } from "../../support/test-db";

describe("isoWeekKey (ISO 8601 week numbering)", () => {
  test("weeks start on Monday; 1 January 2021 belongs to week 53 of 2020", () => {
    expect(isoWeekKey(new Date("2021-01-01T12:00:00Z"))).toBe("2020-W53");
    expect(isoWeekKey(new Date("2021-01-04T00:00:00Z"))).toBe("2021-W01");
    expect(isoWeekKey(new Date("2026-12-02T08:00:00Z"))).toBe("2026-W49");
    expect(isoWeekKey(new Date("2026-12-06T23:00:00Z"))).toBe("2026-W49");
    expect(isoWeekKey(new Date("2026-12-07T00:00:00Z"))).toBe("2026-W50");
  });
});

describe("the weekly digest on the demo", () => {
  let db: Db;
  let tide: number;
  beforeAll(async () => {
    ({ db } = await createTestDb());
    await loadDemo(db);
    tide = (await findOrganisationBySlug(db, "tidewater")).id;
    await recomputeOrganisation(db, tide);
  }, 120_000);

  test("lists the new signals and this week's state changes, in both parts", async () => {
    const manager = await db.all<{ id: number }>(
      sql`select id from users where email = 'manager@recurra.example'`,
    );
    const scope = {
      organisationId: tide,
      userId: Number(manager[0]?.id),
      role: "manager" as const,
    };
    const [issue] = await listKnownIssues(db, scope, { state: "watching" });
    await changeKnownIssueState(db, scope, {
      knownIssueId: issue!.id,
      toState: "confirmed",
      reason: "Seen five times.",
    });
    const digest = await buildDigest(db, tide, new Date(Date.now() - 7 * 86_400_000));
    const [{ n } = { n: 0 }] = await db.all<{ n: number }>(
      sql`select count(*) as n from signals where organisation_id = ${tide}`,
    );
    expect(digest.newSignals.length).toBe(Math.min(20, Number(n)));
    expect(digest.newSignals.length).toBeGreaterThan(0);
    expect(digest.stateChanges).toEqual([
      expect.objectContaining({ title: issue!.title, from: "Watching", to: "Confirmed" }),
    ]);
    expect(digest.atRisk.length).toBeGreaterThan(0);
    // Each expected count with its range at the organisation's confidence (cells recomputed by
    // the demo carry their posteriors), and the range holds the count.
    for (const a of digest.atRisk) {
      expect(a.expectedLower).not.toBeNull();
      expect(a.expectedLower!).toBeLessThanOrEqual(a.expected);
      expect(a.expectedUpper!).toBeGreaterThanOrEqual(a.expected);
    }
    const mail = renderDigest(digest);
    // Each at-risk vehicle in words with its range; the level said once.
    const first = digest.atRisk[0]!;
    expect(mail.text).toContain(
      `${first.vehicle}: ${first.why} — ${describeOutlook({
        expected: first.expected,
        lower: first.expectedLower,
        upper: first.expectedUpper,
        noun: ["failure"],
      })}`,
    );
    expect(mail.text).toContain(`at ${Math.round(digest.confidence * 100)}% confidence`);
    // Signals name their fault from the catalogue, never by its slug; no ∞, no exponents.
    const names = await db.all<{ key: string; name: string }>(sql`
      select 'dtc:' || code as key, code || ' — ' || description as name from dtc_codes
      union all
      select 'component:' || slug, system || ' → ' || name from components`);
    const nameOf = new Map(names.map((n) => [n.key, n.name]));
    const keys = await db.all<{ fault_key: string }>(sql`
      select fault_key from signals where organisation_id = ${tide} and kind = 'failure'`);
    const expectedNames = new Set(keys.map((k) => nameOf.get(k.fault_key)));
    for (const s of digest.newSignals) {
      expect(expectedNames.has(s.fault)).toBe(true);
      expect(s.label).toBe(`${s.cohort} · ${s.fault}`);
    }
    expect(mail.text).not.toMatch(/∞|\de-\d/);
    expect(mail.subject).toMatch(
      /^Recurra weekly digest: Tidewater Parcel Co-op — \d+ new signals?$/,
    );
    for (const part of [mail.text, mail.html]) {
      expect(part).toContain(digest.newSignals[0]!.label.split(" · ")[0]);
      expect(part).toContain("Seen five times.");
    }
  });

  test("top comebacks count failure lines only: scheduled service twice is not a comeback", async () => {
    const [vehicle] = await db.all<{ id: number }>(
      sql`select id from vehicles where organisation_id = ${tide} order by id limit 1`,
    );
    const [oil] = await db.all<{ id: number }>(
      sql`select id from components where slug = 'engine-mechanical/oil-service'`,
    );
    const day = (ago: number) => new Date(Date.now() - ago * 86_400_000).toISOString().slice(0, 10);
    for (const [n, ago] of [
      [1, 5],
      [2, 1],
    ] as const) {
      const [order] = await db
        .insert(repairOrders)
        .values({
          organisationId: tide,
          vehicleId: Number(vehicle!.id),
          roNumber: `DIGEST-OIL-${n}`,
          openedOn: day(ago),
          odometerMi: 900_000 + n,
        })
        .returning();
      await db.insert(repairLines).values({
        organisationId: tide,
        repairOrderId: order!.id,
        vehicleId: Number(vehicle!.id),
        openedOn: day(ago),
        odometerMi: 900_000 + n,
        componentId: Number(oil!.id),
        kind: "service",
        correction: "Oil and filter changed per schedule",
      });
    }
    const digest = await buildDigest(db, tide, new Date(Date.now() - 7 * 86_400_000));
    expect(digest.comebacks.map((c) => c.fault)).not.toContain(
      "Engine mechanical → Oil and filter",
    );
  });

  test("goes once a week to the members who opted in; --force sends again", async () => {
    const now = new Date("2026-12-07T07:00:00Z");
    const first = await sendDigest(db, tide, { now });
    // The demo's manager and admin opted in.
    expect(first).toMatchObject({ week: "2026-W50", skipped: false, recipients: 2 });
    const again = await sendDigest(db, tide, { now });
    expect(again).toMatchObject({ skipped: true, recipients: 0 });
    const outbox = await db.all<{ to_address: string }>(sql`
      select to_address from email_outbox where subject like 'Recurra weekly digest:%' order by to_address`);
    expect(outbox.map((o) => o.to_address)).toEqual([
      "admin@recurra.example",
      "manager@recurra.example",
    ]);
    // The manager opts out; a forced send goes to the admin only.
    const [m] = await db.all<{ id: number }>(
      sql`select id from users where email = 'manager@recurra.example'`,
    );
    await setDigestOptIn(
      db,
      { organisationId: tide, userId: Number(m?.id), role: "manager" },
      false,
    );
    expect((await sendDigest(db, tide, { now, force: true })).recipients).toBe(1);
  });
});
