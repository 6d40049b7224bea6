import type { Db } from "@/db";
import { hashPassword } from "@/lib/auth/password";
import { listComponentIds, loadReferenceData } from "../reference";
import { DEMO_ACCOUNTS, DEMO_ORG_SLUGS, DEMO_PASSWORD, type DemoOrgSlug } from "./accounts";
import { buildDemoDataset, DEFAULT_DEMO_SEED } from "./dataset";
import { insertDemoKnownIssues } from "./known-issues";
import {
  countDemoRows,
  deleteOrganisations,
  findDemoOrganisations,
  insertDemoOrganisation,
  upsertDemoAccounts,
  type DemoOrganisationCounts,
} from "./insert";

/**
 * The invented demo: Tidewater Parcel Co-op (a delivery fleet) and Northgate Auto Clinic (an
 * independent shop), generated from a fixed seed with a few planted patterns among ordinary
 * wear and tear. See patterns.ts for what is planted and where.
 */

export { DEMO_ACCOUNTS, DEMO_ORG_SLUGS, DEMO_PASSWORD, type DemoAccount } from "./accounts";
export { DEMO_END, DEMO_START } from "./calendar";
export { buildDemoDataset, DEFAULT_DEMO_SEED } from "./dataset";
export type { DemoDataset, DemoOrganisation } from "./types";

export type DemoSummary = {
  status: "loaded" | "already-loaded";
  organisations: DemoOrganisationCounts[];
  users: number;
  millis: number;
};

export type LoadDemoOptions = {
  seed?: number;
  /** Delete the demo organisations (and all their rows) and load them again. */
  reset?: boolean;
  log?: (msg: string) => void;
};

/**
 * Loads the reference data and the demo organisations, accounts and records. Does nothing
 * (status "already-loaded") when both demo organisations exist, unless reset is set. Refuses
 * to touch an organisation that holds a demo slug but is not marked as a demo.
 */
export async function loadDemo(db: Db, opts: LoadDemoOptions = {}): Promise<DemoSummary> {
  const started = performance.now();
  const log = opts.log ?? (() => {});
  const summarise = async (status: DemoSummary["status"]): Promise<DemoSummary> => ({
    status,
    organisations: await countDemoRows(db),
    users: DEMO_ACCOUNTS.length,
    millis: Math.round(performance.now() - started),
  });

  await loadReferenceData(db);
  const isLoaded = (found: { slug: string; isDemo: boolean }[]) => {
    const foreign = found.find((o) => !o.isDemo);
    if (foreign) {
      throw new Error(
        `loadDemo: organisation "${foreign.slug}" exists and is not a demo; refusing to replace it`,
      );
    }
    return found.length === DEMO_ORG_SLUGS.length && !opts.reset;
  };
  if (isLoaded(await findDemoOrganisations(db))) return summarise("already-loaded");

  const seed = opts.seed ?? DEFAULT_DEMO_SEED;
  log(`generating the demo (seed ${seed})`);
  const dataset = buildDemoDataset(seed);
  // Hash outside the transaction: bcrypt is slow on purpose and the write lock should be short.
  const hashes = new Map<string, string>();
  for (const account of DEMO_ACCOUNTS) hashes.set(account.email, await hashPassword(DEMO_PASSWORD));

  const didLoad = await db.transaction(async (tx) => {
    // Look again under the write lock: another process may have loaded the demo meanwhile.
    const existing = await findDemoOrganisations(tx);
    if (isLoaded(existing)) return false;
    if (existing.length > 0) {
      log(`deleting the existing demo organisations`);
      await deleteOrganisations(
        tx,
        existing.map((o) => o.id),
      );
    }
    const componentIds = await listComponentIds(tx);
    const organisationIds = new Map<string, number>();
    for (const org of dataset.organisations) {
      organisationIds.set(org.slug, await insertDemoOrganisation(tx, org, componentIds, log));
    }
    await upsertDemoAccounts(tx, hashes, organisationIds);
    for (const [slug, id] of organisationIds) {
      await insertDemoKnownIssues(tx, slug as DemoOrgSlug, id);
    }
    return true;
  });
  return summarise(didLoad ? "loaded" : "already-loaded");
}
