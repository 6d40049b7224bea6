import { execFile } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { createTestDatabaseUrl } from "../../support/test-db";

const run = promisify(execFile);
const dir = mkdtempSync(join(tmpdir(), "recurra-cli-"));
let env: NodeJS.ProcessEnv = { ...process.env };
let stopDatabase = async () => {};

beforeAll(async () => {
  // A file in `dir`, or a libSQL server of its own in a server run.
  const database = await createTestDatabaseUrl();
  stopDatabase = database.stop;
  env = { ...process.env, DATABASE_URL: database.url, RECURRA_DATA_DIR: dir };
});
afterAll(() => stopDatabase());

/** Runs `npm run recurra -- …` the way a user does, returning exit code, stdout and stderr. */
async function recurra(...args: string[]) {
  try {
    const { stdout, stderr } = await run(
      "npx",
      ["tsx", "--conditions=react-server", "jobs/cli.ts", ...args],
      {
        env,
      },
    );
    return { code: 0, stdout, stderr };
  } catch (e) {
    const err = e as { code: number; stdout: string; stderr: string };
    return { code: err.code, stdout: err.stdout, stderr: err.stderr };
  }
}

/** With --json, stdout holds exactly one JSON document. */
function json(stdout: string) {
  const lines = stdout.trim().split("\n");
  expect(lines).toHaveLength(1);
  return JSON.parse(lines[0] ?? "") as Record<string, unknown>;
}

describe("command line", () => {
  test("org create, org list and user add, with --json", async () => {
    const created = await recurra(
      "org",
      "create",
      "harbour-vans",
      "--name",
      "Harbour Vans",
      "--kind",
      "fleet",
      "--json",
    );
    expect(created.code).toBe(0);
    expect(json(created.stdout)).toMatchObject({
      ok: true,
      organisation: { slug: "harbour-vans", kind: "fleet" },
    });

    const again = await recurra(
      "org",
      "create",
      "harbour-vans",
      "--name",
      "Harbour Vans",
      "--json",
    );
    expect(again.code).toBe(1);
    expect(json(again.stdout)).toEqual({
      ok: false,
      error: 'An organisation with slug "harbour-vans" exists.',
    });

    const bad = await recurra("org", "create", "Not A Slug", "--name", "X", "--json");
    expect(bad.code).toBe(1);
    expect(json(bad.stdout).error).toMatch(/lower-case/);

    const user = await recurra(
      "user",
      "add",
      "--org",
      "harbour-vans",
      "--role",
      "technician",
      "--email",
      "Tech@Harbour.example",
      "--json",
    );
    expect(user.code).toBe(0);
    const u = json(user.stdout);
    expect(u).toMatchObject({
      ok: true,
      role: "technician",
      isNewUser: true,
      user: { email: "tech@harbour.example" },
    });
    expect(String(u.generatedPassword)).toMatch(/^[A-Za-z0-9_-]{16}$/);

    // Adding the same person again changes the role and keeps the password (none printed).
    const promoted = await recurra(
      "user",
      "add",
      "--org",
      "harbour-vans",
      "--role",
      "manager",
      "--email",
      "tech@harbour.example",
      "--json",
    );
    expect(json(promoted.stdout)).toMatchObject({ ok: true, role: "manager", isNewUser: false });
    expect(json(promoted.stdout)).not.toHaveProperty("generatedPassword");

    const short = await recurra(
      "user",
      "add",
      "--org",
      "harbour-vans",
      "--role",
      "viewer",
      "--email",
      "v@harbour.example",
      "--password",
      "short",
      "--json",
    );
    expect(short.code).toBe(1);
    expect(json(short.stdout).error).toMatch(/at least 10 characters/);

    const list = await recurra("org", "list", "--json");
    const orgs = json(list.stdout).organisations as {
      slug: string;
      members: number;
      vehicles: number;
    }[];
    expect(orgs).toEqual([
      expect.objectContaining({ slug: "harbour-vans", members: 1, vehicles: 0 }),
    ]);

    const text = await recurra("org", "list");
    expect(text.stdout).toMatch(/harbour-vans\s+fleet\s+0 vehicles\s+Harbour Vans/);
  }, 120_000); // eight CLI processes (npx → tsx → node): slow on a busy 2-core machine

  test("stock prints the parts plan as one JSON array, and refuses a bad service level", async () => {
    expect((await recurra("demo", "load")).code).toBe(0);
    const r = await recurra("stock", "--org", "northgate", "--service-level", "0.9", "--json");
    expect(r.code).toBe(0);
    const lines = r.stdout.trim().split("\n");
    expect(lines).toHaveLength(1);
    const parts = JSON.parse(lines[0] ?? "") as Record<string, number | string | null>[];
    expect(parts.length).toBeGreaterThan(100);
    for (const p of parts) {
      expect(Object.keys(p).sort()).toEqual(
        [
          "component",
          "demandKind",
          "expectedDemand",
          "onHand",
          "partNumber",
          "reorder",
          "stockLevel",
        ].sort(),
      );
      expect(p.reorder).toBe(Math.max(0, Number(p.stockLevel) - Number(p.onHand)));
      // The kinds of work behind the demand, largest first; none for a part nobody needs.
      expect(p.demandKind).toMatch(/^((service|wear|failure)(\+(service|wear|failure)){0,2})?$/);
      if (p.demandKind === "") expect(p.expectedDemand).toBe(0);
    }
    expect(parts.some((p) => String(p.demandKind).includes("failure"))).toBe(true);
    expect(parts.some((p) => String(p.demandKind).includes("service"))).toBe(true);
    const bad = await recurra("stock", "--org", "northgate", "--service-level", "0.5", "--json");
    expect(bad.code).toBe(1);
    expect(json(bad.stdout).error).toMatch(/Choose 80%/);
  }, 120_000);

  test("an unknown role is refused by the argument parser", async () => {
    const r = await recurra(
      "user",
      "add",
      "--org",
      "x",
      "--role",
      "owner",
      "--email",
      "a@b.example",
    );
    expect(r.code).not.toBe(0);
    expect(r.stderr).toMatch(/Allowed choices are admin, manager, technician, viewer/);
  });

  test("import refuses dates that fit both orders without --date-order, and reads them with it", async () => {
    expect((await recurra("org", "create", "date-vans", "--name", "Date Vans")).code).toBe(0);
    const file = join(dir, "ambiguous.csv");
    writeFileSync(
      file,
      [
        "RO number,Unit,Opened,Odometer,Complaint,Make,Model,Year",
        "D-1,DV-1,03/04/2025,41000,Noise,Aurel,Merlin,2021",
        "D-2,DV-1,05/06/2025,43000,Squeal,Aurel,Merlin,2021",
      ].join("\n"),
    );
    const args = ["import", "--org", "date-vans", "--kind", "repairs", file, "--json"];
    const refused = await recurra(...args);
    expect(refused.code).toBe(1);
    const { ok, error } = json(refused.stdout);
    expect(ok).toBe(false);
    expect(error).toBe(
      "The dates in “Opened” (for example 03/04/2025 and 05/06/2025) fit both day/month/year and month/day/year. Choose the order. Give --date-order dmy or --date-order mdy.",
    );
    // The refused import was cancelled: the same file can be imported again, with the order.
    const done = await recurra(...args, "--date-order", "dmy");
    expect(done.code).toBe(0);
    expect(json(done.stdout)).toMatchObject({ ok: true, rows: 2, imported: 2, rejected: 0 });
  }, 120_000);
});
