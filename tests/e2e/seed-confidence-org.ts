/**
 * An organisation of its own for the browser test that changes the interval confidence: a copy
 * of the demo's Tidewater fleet (same generator, same seed) under another slug, with one admin
 * who belongs to it alone, its known issues and its computed cells. Changing its settings
 * recomputes only its cells, so the specs that read Tidewater and Northgate in parallel are not
 * disturbed. Idempotent: does nothing when the organisation exists.
 *
 * Run with `npx tsx --conditions=react-server tests/e2e/seed-confidence-org.ts` (DATABASE_URL).
 */
import { eq } from "drizzle-orm";
import { getDatabase } from "@/db";
import { memberships, organisations, users } from "@/db/schema";
import { buildDemoDataset, DEMO_PASSWORD } from "@/db/seed/demo";
import { insertDemoOrganisation } from "@/db/seed/demo/insert";
import { insertDemoKnownIssues } from "@/db/seed/demo/known-issues";
import { listComponentIds } from "@/db/seed/reference";
import { recomputeOrganisation } from "@/jobs/recompute/recompute";
import { hashPassword } from "@/lib/auth/password";
import { CONFIDENCE_ADMIN, CONFIDENCE_ORG } from "./confidence-org";

async function main() {
  const { db, client } = await getDatabase();
  try {
    const [found] = await db
      .select({ id: organisations.id })
      .from(organisations)
      .where(eq(organisations.slug, CONFIDENCE_ORG.slug));
    if (found) return;
    const tidewater = buildDemoDataset().organisations.find((o) => o.slug === "tidewater");
    if (!tidewater) throw new Error("seed-confidence-org: the demo has no Tidewater");
    const passwordHash = await hashPassword(DEMO_PASSWORD);
    const organisationId = await db.transaction(async (tx) => {
      const id = await insertDemoOrganisation(
        tx,
        { ...tidewater, slug: CONFIDENCE_ORG.slug, name: CONFIDENCE_ORG.name },
        await listComponentIds(tx),
        () => {},
      );
      const [user] = await tx
        .insert(users)
        .values({ email: CONFIDENCE_ADMIN, name: "Ilse Marrow", passwordHash })
        .returning({ id: users.id });
      await tx.insert(memberships).values({ organisationId: id, userId: user!.id, role: "admin" });
      await insertDemoKnownIssues(tx, "tidewater", id);
      return id;
    });
    await recomputeOrganisation(db, organisationId);
  } finally {
    client.close();
  }
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
