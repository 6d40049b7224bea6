import { eq, inArray, sql } from "drizzle-orm";
import type { DbOrTx } from "@/db";
import {
  campaignVehicles,
  campaigns,
  analysisRuns,
  auditLog,
  cellStats,
  columnMappings,
  componentAliases,
  capturedMail,
  emailOutbox,
  faultEvents,
  fuelTransactions,
  generations,
  importRejects,
  imports,
  invitations,
  jobs,
  knownIssueAttachments,
  knownIssueCautions,
  knownIssueChecks,
  knownIssueCohorts,
  knownIssueComments,
  knownIssueFindings,
  knownIssueParts,
  knownIssues,
  knownIssueStates,
  knownIssueWatchers,
  memberships,
  organisations,
  parts,
  repairLineCodes,
  repairLines,
  repairOrders,
  signals,
  users,
  vehicles,
} from "@/db/schema";
import { isScheduledWork, lineKind, type ComponentKind } from "@/lib/component-kinds";
import { COMPONENTS } from "../reference";
import { DEMO_ACCOUNTS, DEMO_ORG_SLUGS } from "./accounts";
import { DEMO_START } from "./calendar";
import type { DemoOrganisation } from "./types";

/**
 * Writes the generated demo into the database: multi-row INSERTs of a few hundred rows inside
 * the caller's transaction (row-by-row inserts would take minutes), ids read back with
 * RETURNING and matched on a natural key, never on row order.
 */

/** Rows per INSERT: about 8,000 parameters for the widest table, well under SQLite's limit. */
const CHUNK_ROWS = 400;

/** Recurra's default kind of each component, by slug. */
const DEFAULT_KIND: ReadonlyMap<string, ComponentKind> = new Map(
  COMPONENTS.map((c) => [c.slug, c.kind]),
);

/** Writes rows a chunk at a time and collects what each chunk's RETURNING gave back. */
async function insertInChunks<Row, Result = never>(
  rows: readonly Row[],
  write: (chunk: Row[]) => Promise<Result[] | { rowsAffected: number }>,
): Promise<Result[]> {
  const results: Result[] = [];
  for (let i = 0; i < rows.length; i += CHUNK_ROWS) {
    const written = await write(rows.slice(i, i + CHUNK_ROWS));
    if (Array.isArray(written)) results.push(...written);
  }
  return results;
}

function requireId(ids: ReadonlyMap<string, number>, key: string, what: string): number {
  const id = ids.get(key);
  if (id === undefined) throw new Error(`insertDemoOrganisation: no ${what} for ${key}`);
  return id;
}

function requireHash(hashes: ReadonlyMap<string, string>, email: string): string {
  const hash = hashes.get(email);
  if (hash === undefined) throw new Error(`upsertDemoAccounts: no password hash for ${email}`);
  return hash;
}

/** When the demo's records were "entered": a fixed time, so reloads are byte-identical. */
const ENTERED_AT = `${DEMO_START}T06:00:00.000Z`;

function enteredOn(isoDate: string): string {
  return isoDate > DEMO_START ? `${isoDate}T18:00:00.000Z` : ENTERED_AT;
}

/** Inserts one generated organisation with all its rows; returns its id. */
export async function insertDemoOrganisation(
  tx: DbOrTx,
  org: DemoOrganisation,
  componentIds: ReadonlyMap<string, number>,
  log: (msg: string) => void,
): Promise<number> {
  const [created] = await tx
    .insert(organisations)
    .values({
      slug: org.slug,
      name: org.name,
      kind: org.kind,
      distanceUnit: "mi",
      isDemo: true,
      createdAt: ENTERED_AT,
    })
    .returning({ id: organisations.id });
  if (!created) throw new Error(`insertDemoOrganisation: ${org.slug} was not created`);
  const organisationId = created.id;
  const componentOf = (slug: string | null) =>
    slug ? requireId(componentIds, slug, "component") : null;

  const genRows = await tx
    .insert(generations)
    .values(org.generations.map((g) => ({ ...g, organisationId, createdAt: ENTERED_AT })))
    .returning({ id: generations.id, model: generations.model, label: generations.label });
  const generationIds = new Map(genRows.map((g) => [`${g.model} ${g.label}`, g.id]));

  const vehicleRows = await insertInChunks(
    org.vehicles.map((v) => ({
      organisationId,
      vin: v.vin,
      unitNumber: v.unitNumber,
      make: v.make,
      model: v.model,
      modelYear: v.modelYear,
      engine: v.engine,
      transmission: v.transmission,
      inServiceDate: v.inServiceDate,
      odometerUnit: "mi" as const,
      lastOdometerMi: v.lastOdometerMi,
      lastOdometerOn: v.lastOdometerOn,
      generationId: v.generationLabel
        ? (generationIds.get(`${v.model} ${v.generationLabel}`) ?? null)
        : null,
      createdAt: enteredOn(v.inServiceDate),
    })),
    (chunk) => tx.insert(vehicles).values(chunk).returning({ id: vehicles.id, vin: vehicles.vin }),
  );
  const vehicleIds = new Map(vehicleRows.map((v) => [v.vin ?? "", v.id]));
  const vehicleOf = (vin: string) => requireId(vehicleIds, vin, "vehicle");
  log(`${org.slug}: ${vehicleRows.length} vehicles`);

  const orderRows = await insertInChunks(
    org.repairOrders.map((o) => ({
      organisationId,
      vehicleId: vehicleOf(o.vin),
      roNumber: o.roNumber,
      openedOn: o.openedOn,
      closedOn: o.closedOn,
      odometerMi: o.odometerMi,
      vendor: o.vendor,
      createdAt: enteredOn(o.closedOn),
    })),
    (chunk) =>
      tx
        .insert(repairOrders)
        .values(chunk)
        .returning({ id: repairOrders.id, roNumber: repairOrders.roNumber }),
  );
  const orderIds = new Map(orderRows.map((o) => [o.roNumber, o.id]));

  // Vehicle, date and odometer are copied from the order onto each line (see the schema).
  const lineRows = org.repairOrders.flatMap((o) => {
    const repairOrderId = requireId(orderIds, o.roNumber, "repair order");
    const vehicleId = vehicleOf(o.vin);
    return o.lines.map((l) => {
      // Classified as an import classifies it (a new organisation has Recurra's default kinds).
      const isScheduled = isScheduledWork({
        complaint: l.complaint,
        cause: l.cause,
        correction: l.correction,
        hasDtc: l.dtcCodes.length > 0,
      });
      return {
        organisationId,
        repairOrderId,
        vehicleId,
        lineNo: l.lineNo,
        openedOn: o.openedOn,
        odometerMi: o.odometerMi,
        complaint: l.complaint,
        cause: l.cause,
        correction: l.correction,
        dtcCodes: l.dtcCodes.length > 0 ? l.dtcCodes.join(" ") : null,
        componentId: componentOf(l.componentSlug),
        symptom: l.symptom,
        laborHours: l.laborHours,
        partsCostCents: l.partsCostCents,
        laborCostCents: l.laborCostCents,
        partNumbers: l.partNumbers.length > 0 ? l.partNumbers.join(" ") : null,
        technician: l.technician,
        vendor: l.vendor,
        isWarranty: l.isWarranty,
        isScheduled,
        kind: lineKind(
          l.componentSlug ? (DEFAULT_KIND.get(l.componentSlug) ?? null) : null,
          isScheduled,
        ),
      };
    });
  });
  const insertedLines = await insertInChunks(lineRows, (chunk) =>
    tx.insert(repairLines).values(chunk).returning({
      id: repairLines.id,
      repairOrderId: repairLines.repairOrderId,
      lineNo: repairLines.lineNo,
    }),
  );
  const lineIds = new Map(insertedLines.map((l) => [`${l.repairOrderId}/${l.lineNo}`, l.id]));
  log(`${org.slug}: ${orderRows.length} repair orders, ${insertedLines.length} repair lines`);

  const codeRows = lineRows.flatMap((l) =>
    (l.dtcCodes ?? "")
      .split(" ")
      .filter(Boolean)
      .map((dtc) => ({
        organisationId,
        repairLineId: requireId(lineIds, `${l.repairOrderId}/${l.lineNo}`, "repair line"),
        vehicleId: l.vehicleId,
        dtc,
      })),
  );
  await insertInChunks(codeRows, (chunk) => tx.insert(repairLineCodes).values(chunk));

  const keyByVehicle = <T extends { vin: string }>(rows: readonly T[]) =>
    rows.map(({ vin, ...row }) => ({ ...row, organisationId, vehicleId: vehicleOf(vin) }));
  await insertInChunks(keyByVehicle(org.faultEvents), (chunk) =>
    tx.insert(faultEvents).values(chunk),
  );
  await insertInChunks(keyByVehicle(org.fuelTransactions), (chunk) =>
    tx.insert(fuelTransactions).values(chunk),
  );
  await insertInChunks(
    org.parts.map(({ componentSlug, ...p }) => ({
      ...p,
      organisationId,
      componentId: componentOf(componentSlug),
      createdAt: ENTERED_AT,
    })),
    (chunk) => tx.insert(parts).values(chunk),
  );
  log(
    `${org.slug}: ${codeRows.length} line codes, ${org.faultEvents.length} fault events, ` +
      `${org.fuelTransactions.length} fuel transactions, ${org.parts.length} parts`,
  );
  return organisationId;
}

/**
 * Tables that carry an organisation id, children before parents, so deleting in this order
 * never trips a foreign key and never leaves a cascade with much to do.
 */
const TENANT_TABLES_CHILD_FIRST = [
  campaignVehicles,
  campaigns,
  knownIssueFindings,
  knownIssueAttachments,
  knownIssueWatchers,
  knownIssueParts,
  knownIssueCautions,
  knownIssueChecks,
  knownIssueComments,
  knownIssueStates,
  knownIssueCohorts,
  knownIssues,
  signals,
  cellStats,
  analysisRuns,
  repairLineCodes,
  repairLines,
  repairOrders,
  faultEvents,
  fuelTransactions,
  parts,
  vehicles,
  generations,
  componentAliases,
  importRejects,
  imports,
  columnMappings,
  jobs,
  capturedMail,
  emailOutbox,
  auditLog,
  invitations,
  memberships,
] as const;

/** Deletes organisations and everything that belongs to them. */
export async function deleteOrganisations(tx: DbOrTx, ids: number[]): Promise<void> {
  if (ids.length === 0) return;
  for (const table of TENANT_TABLES_CHILD_FIRST) {
    await tx.delete(table).where(inArray(table.organisationId, ids));
  }
  await tx.delete(organisations).where(inArray(organisations.id, ids));
}

/** Creates or updates the demo accounts (by e-mail) and their memberships. */
export async function upsertDemoAccounts(
  tx: DbOrTx,
  passwordHashes: ReadonlyMap<string, string>,
  organisationIds: ReadonlyMap<string, number>,
): Promise<number> {
  const accounts = await tx
    .insert(users)
    .values(
      DEMO_ACCOUNTS.map((a) => ({
        email: a.email,
        name: a.name,
        passwordHash: requireHash(passwordHashes, a.email),
      })),
    )
    .onConflictDoUpdate({
      target: users.email,
      set: {
        name: sql`excluded.name`,
        passwordHash: sql`excluded.password_hash`,
        disabledAt: null,
      },
    })
    .returning({ id: users.id, email: users.email });
  const userIds = new Map(accounts.map((u) => [u.email, u.id]));
  const rows = DEMO_ACCOUNTS.flatMap((a) =>
    a.organisations.map((slug) => ({
      organisationId: requireId(organisationIds, slug, "organisation"),
      userId: requireId(userIds, a.email, "user"),
      role: a.role,
      // Managers and admins of the demo read the weekly digest.
      wantsDigest: a.role === "manager" || a.role === "admin",
    })),
  );
  await tx
    .insert(memberships)
    .values(rows)
    .onConflictDoUpdate({
      target: [memberships.organisationId, memberships.userId],
      set: { role: sql`excluded.role`, wantsDigest: sql`excluded.wants_digest` },
    });
  return accounts.length;
}

/** The tables counted in a demo summary. */
const COUNTED_TABLES = {
  vehicles,
  repairOrders,
  repairLines,
  faultEvents,
  fuelTransactions,
  parts,
  generations,
} as const;

export type DemoOrganisationCounts = { slug: string } & Record<keyof typeof COUNTED_TABLES, number>;

/** Row counts of the demo organisations that exist, in DEMO_ORG_SLUGS order. */
export async function countDemoRows(db: DbOrTx): Promise<DemoOrganisationCounts[]> {
  const found = await findDemoOrganisations(db);
  const result: DemoOrganisationCounts[] = [];
  for (const slug of DEMO_ORG_SLUGS) {
    const org = found.find((o) => o.slug === slug);
    if (!org) continue;
    const counts: DemoOrganisationCounts = {
      slug,
      vehicles: 0,
      repairOrders: 0,
      repairLines: 0,
      faultEvents: 0,
      fuelTransactions: 0,
      parts: 0,
      generations: 0,
    };
    for (const key of Object.keys(COUNTED_TABLES) as (keyof typeof COUNTED_TABLES)[]) {
      const table = COUNTED_TABLES[key];
      counts[key] = await db.$count(table, eq(table.organisationId, org.id));
    }
    result.push(counts);
  }
  return result;
}

/** The organisations that hold the demo slugs, demo or not. */
export async function findDemoOrganisations(
  db: DbOrTx,
): Promise<{ id: number; slug: string; isDemo: boolean }[]> {
  return db
    .select({ id: organisations.id, slug: organisations.slug, isDemo: organisations.isDemo })
    .from(organisations)
    .where(inArray(organisations.slug, [...DEMO_ORG_SLUGS]));
}
