import { sql } from "drizzle-orm";
import { getDb } from "@/db";
import { getMigrationStatus } from "@/db/migrate";

export const dynamic = "force-dynamic";

/** Liveness and readiness: the database answers and its migrations are current. */
export async function GET() {
  try {
    const db = await getDb();
    await db.run(sql`select 1`);
    const migrations = await getMigrationStatus(db);
    const ok = migrations.isCurrent;
    return Response.json(
      { ok, database: "reachable", migrations },
      { status: ok ? 200 : 503, headers: { "cache-control": "no-store" } },
    );
  } catch (e) {
    console.error("[recurra] health check failed:", e);
    return Response.json(
      { ok: false, database: "unreachable" },
      { status: 503, headers: { "cache-control": "no-store" } },
    );
  }
}
