import { rmSync } from "node:fs";
import type { Client } from "@libsql/client";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openDatabase, type Db } from "@/db";
import { migrateDatabase } from "@/db/migrate";
import { components, dtcCodes } from "@/db/schema";
import {
  COMPONENTS,
  DTC_REFERENCE,
  listComponentIds,
  loadReferenceData,
} from "@/db/seed/reference";
import { createTestDatabaseUrl } from "../../support/test-db";
import { parseDtc } from "@/lib/dtc";

/** The generic codes trade-facts.md lists for the demo (SAE J2012 structure). */
// prettier-ignore
const REQUIRED_CODES = [
  "P0300", "P0301", "P0171", "P0087", "P0335", "P0506", "P0441", "P0443", "P0455", "P0456",
  "P0457", "P0496", "P0550", "U0131", "P0562", "P0563", "P0620", "P0700", "P0730", "P0750",
];

describe("component list", () => {
  it("gives every component a kind, with the trade's scheduled service and wear items marked (common practice)", () => {
    const kindOf = new Map(COMPONENTS.map((c) => [c.slug, c.kind]));
    for (const slug of [
      "engine-mechanical/oil-service",
      "engine-mechanical/air-filter",
      "hvac/cabin-filter",
      "transmission/fluid-service",
      "brakes/brake-fluid",
      "cooling/coolant",
      "tyres-wheels/rotation",
      "inspection/scheduled-inspection",
    ])
      expect(kindOf.get(slug as never), slug).toBe("service");
    for (const slug of [
      "brakes/front-pads",
      "brakes/discs",
      "body-electrical/wipers",
      "tyres-wheels/tyres",
      "transmission/clutch",
    ])
      expect(kindOf.get(slug as never), slug).toBe("wear");
    for (const slug of [
      "fuel-vapour/purge-valve",
      "power-distribution/body-ground",
      "steering/assist-sensor",
    ])
      expect(kindOf.get(slug as never), slug).toBe("failure");
  });

  it("has about 40–75 entries with unique, well-formed slugs", () => {
    expect(COMPONENTS.length).toBeGreaterThanOrEqual(40);
    expect(COMPONENTS.length).toBeLessThanOrEqual(75);
    const slugs = COMPONENTS.map((c) => c.slug);
    expect(new Set(slugs).size).toBe(slugs.length);
    for (const c of COMPONENTS) expect(c.slug).toMatch(/^[a-z-]+\/[a-z-]+$/);
    const names = COMPONENTS.map((c) => `${c.system} → ${c.name}`);
    expect(new Set(names).size).toBe(names.length);
  });

  it("groups components under one system per slug prefix", () => {
    const systemOf = new Map<string, string>();
    for (const c of COMPONENTS) {
      const prefix = c.slug.split("/")[0] as string;
      expect(systemOf.get(prefix) ?? c.system).toBe(c.system);
      systemOf.set(prefix, c.system);
    }
    expect(systemOf.size).toBeGreaterThanOrEqual(12);
  });
});

describe("DTC reference", () => {
  it("holds every generic code the demo relies on, each once", () => {
    const codes = DTC_REFERENCE.map((d) => d.code);
    expect(new Set(codes).size).toBe(codes.length);
    for (const code of REQUIRED_CODES) expect(codes).toContain(code);
    expect(codes.length).toBeGreaterThanOrEqual(REQUIRED_CODES.length + 10);
  });

  it("uses only generic codes (P0/P2, B0, C0, U0 per SAE J2012) with descriptions and known components", () => {
    const slugs = new Set<string>(COMPONENTS.map((c) => c.slug));
    for (const d of DTC_REFERENCE) {
      const info = parseDtc(d.code);
      expect(info?.control, d.code).toBe("generic");
      expect(d.description.length).toBeGreaterThan(10);
      if (d.componentSlug) expect(slugs.has(d.componentSlug), d.code).toBe(true);
    }
    expect(new Set(DTC_REFERENCE.map((d) => d.code[0])).size).toBe(4);
  });
});

describe("loadReferenceData", () => {
  let dir: string;
  let stop: () => Promise<void>;
  let client: Client;
  let db: Db;

  beforeAll(async () => {
    let url: string;
    ({ url, dir, stop } = await createTestDatabaseUrl());
    ({ client, db } = await openDatabase(url));
    await migrateDatabase(db);
  });

  afterAll(async () => {
    client.close();
    await stop();
    rmSync(dir, { recursive: true, force: true });
  });

  it("writes both tables and derives area and control from the code", async () => {
    const result = await loadReferenceData(db);
    expect(result).toEqual({ components: COMPONENTS.length, dtcCodes: DTC_REFERENCE.length });
    expect(await db.$count(components)).toBe(COMPONENTS.length);
    expect(await db.$count(dtcCodes)).toBe(DTC_REFERENCE.length);
    const [u0131] = await db.select().from(dtcCodes).where(eq(dtcCodes.code, "U0131"));
    expect(u0131?.area).toBe("U");
    expect(u0131?.isGeneric).toBe(true);
    const ids = await listComponentIds(db);
    const [p0441] = await db.select().from(dtcCodes).where(eq(dtcCodes.code, "P0441"));
    expect(p0441?.componentId).toBe(ids.get("fuel-vapour/purge-valve"));
  });

  it("is idempotent: a second run keeps ids and restores edited text", async () => {
    const before = await listComponentIds(db);
    await db.update(dtcCodes).set({ description: "edited" }).where(eq(dtcCodes.code, "P0300"));
    await loadReferenceData(db);
    expect(await listComponentIds(db)).toEqual(before);
    expect(await db.$count(components)).toBe(COMPONENTS.length);
    expect(await db.$count(dtcCodes)).toBe(DTC_REFERENCE.length);
    const [p0300] = await db.select().from(dtcCodes).where(eq(dtcCodes.code, "P0300"));
    expect(p0300?.description).not.toBe("edited");
  });
});
