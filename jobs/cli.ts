/**
 * Recurra's command line: `npm run recurra -- <command>`. With --json a command prints one JSON
 * document on stdout (also on failure: { ok: false, error }); logs always go to stderr.
 */
import { randomBytes } from "node:crypto";
import { createReadStream } from "node:fs";
import { readFile } from "node:fs/promises";
import { basename } from "node:path";
import { Command, Option } from "commander";
import { getStockingPlan } from "@/db/queries/stocking";
import { sendDigest } from "./digest/digest";
import { demandKinds } from "@/lib/stocking";
import { StockingQuery } from "@/lib/stocking-request";
import { z } from "zod";
import { getDatabase } from "@/db";
import { migrateDatabase } from "@/db/migrate";
import { cancelImport, getImport, startImport } from "@/db/queries/imports";
import {
  addUserToOrganisation,
  createOrganisation,
  findOrganisationBySlug,
  listOrganisations,
} from "@/db/queries/system";
import {
  DISTANCE_UNITS,
  IMPORT_KINDS,
  ORGANISATION_KINDS,
  ROLES,
  type ImportKind,
} from "@/db/schema";
import { mappingByName, resolveDateFormat } from "@/jobs/import/inspect";
import { mappingToIndexes } from "@/jobs/import/run-import";
import { validateMapping } from "@/lib/import";
import { inspectStoredImport, receiveUpload } from "@/jobs/import/upload";
import { startWorker } from "@/jobs/worker";
import { loadReferenceData } from "@/db/seed/reference";
import { DEMO_ORG_SLUGS, loadDemo } from "@/db/seed/demo";
import { getLatestRun, listRankedCells, type RankedCell } from "@/db/queries/cells";
import { cellOfRanked } from "@/lib/cell-types";
import { formatBand } from "@/lib/format";
import { describeCell, describeTooLittle, sentence, type MetricContext } from "@/lib/metrics";
import { formatProbability, intervalLabel } from "@/lib/plain-words";
import { listComponentKinds, setComponentKind } from "@/db/queries/component-kinds";
import { ANALYSED_KINDS, COMPONENT_KINDS, type AnalysedKind } from "@/lib/component-kinds";
import { getRefuelAnalysis } from "@/db/queries/refuel";
import { recomputeOrganisation } from "@/jobs/recompute/recompute";
import { MIN_PASSWORD_LENGTH } from "@/lib/auth/password";

type Output = { json?: boolean };

/** --date-order's words, as the import's date formats. */
const DATE_ORDERS = { dmy: "dmy", mdy: "mdy", ymd: "iso" } as const;
type ImportCommandOptions = {
  org: string;
  kind: ImportKind;
  mapping?: string;
  dateOrder?: keyof typeof DATE_ORDERS;
};

const log = (msg: string) => process.stderr.write(`${msg}\n`);

/** Runs one command: prints its result (JSON or text) and sets the exit code. */
function action<A extends unknown[]>(fn: (...args: A) => Promise<{ data: unknown; text: string }>) {
  return async (...args: A) => {
    const cmd = args.at(-1) as Command;
    const opts = cmd.optsWithGlobals<Output>();
    try {
      const { data, text } = await fn(...args);
      // A list is printed as a JSON array; anything else as { ok: true, …fields }.
      const doc = Array.isArray(data) ? data : { ok: true, ...(data as object) };
      process.stdout.write(opts.json ? `${JSON.stringify(doc)}\n` : `${text}\n`);
    } catch (e) {
      const message =
        e instanceof z.ZodError ? z.prettifyError(e) : e instanceof Error ? e.message : String(e);
      if (opts.json) process.stdout.write(`${JSON.stringify({ ok: false, error: message })}\n`);
      log(`error: ${message}`);
      process.exitCode = 1;
    } finally {
      (await getDatabase()).client.close();
    }
  };
}

/** Opens DATABASE_URL and brings it to the current schema (and reference data). */
async function openMigrated() {
  const { db } = await getDatabase();
  await migrateDatabase(db);
  await loadReferenceData(db);
  return db;
}

const Slug = z
  .string()
  .regex(/^[a-z0-9][a-z0-9-]{1,39}$/, "A slug is 2–40 lower-case letters, digits or dashes.");

export function buildProgram(): Command {
  const program = new Command("recurra")
    .description("Recurra command line")
    .option("--json", "print one JSON document on stdout")
    .showHelpAfterError();

  const db = program.command("db").description("database");
  db.command("migrate")
    .description("apply committed migrations and load reference data")
    .action(
      action(async () => {
        await openMigrated();
        return { data: { migrated: true }, text: "Database is up to date." };
      }),
    );

  const org = program.command("org").description("organisations");
  org
    .command("create <slug>")
    .description("create an organisation")
    .requiredOption("--name <name>", "display name")
    .addOption(
      new Option("--kind <kind>", "fleet or shop").choices(ORGANISATION_KINDS).default("fleet"),
    )
    .addOption(new Option("--unit <unit>", "distance unit").choices(DISTANCE_UNITS).default("mi"))
    .action(
      action(
        async (slug: string, opts: { name: string; kind: "fleet" | "shop"; unit: "mi" | "km" }) => {
          const created = await createOrganisation(await openMigrated(), {
            slug: Slug.parse(slug),
            name: z.string().trim().min(2).max(120).parse(opts.name),
            kind: opts.kind,
            distanceUnit: opts.unit,
          });
          return {
            data: {
              organisation: {
                id: created.id,
                slug: created.slug,
                name: created.name,
                kind: created.kind,
              },
            },
            text: `Created organisation ${created.slug} (${created.name}).`,
          };
        },
      ),
    );
  org
    .command("list")
    .description("list organisations")
    .action(
      action(async () => {
        const rows = await listOrganisations(await openMigrated());
        const organisations = rows.map((r) => ({
          ...r,
          members: Number(r.members),
          vehicles: Number(r.vehicles),
        }));
        return {
          data: { organisations },
          text:
            organisations
              .map(
                (o) =>
                  `${o.slug.padEnd(20)} ${o.kind.padEnd(6)} ${String(o.vehicles).padStart(6)} vehicles  ${o.name}`,
              )
              .join("\n") || "No organisations yet.",
        };
      }),
    );

  const user = program.command("user").description("users");
  user
    .command("add")
    .description("add a user to an organisation (creates the account if new)")
    .requiredOption("--org <slug>", "organisation slug")
    .addOption(new Option("--role <role>", "role").choices(ROLES).makeOptionMandatory())
    .requiredOption("--email <email>", "e-mail address")
    .option("--name <name>", "display name")
    .option(
      "--password <password>",
      "password (or RECURRA_PASSWORD; generated when both are missing)",
    )
    .action(
      action(
        async (opts: {
          org: string;
          role: (typeof ROLES)[number];
          email: string;
          name?: string;
          password?: string;
        }) => {
          const given = opts.password ?? process.env.RECURRA_PASSWORD;
          if (given !== undefined && given.length < MIN_PASSWORD_LENGTH) {
            throw new Error(`A password has at least ${MIN_PASSWORD_LENGTH} characters.`);
          }
          const email = z.email("Not an e-mail address.").parse(opts.email.trim().toLowerCase());
          // A generated password is only set (and printed, once) when the account is new.
          const password = given ?? randomBytes(12).toString("base64url");
          const result = await addUserToOrganisation(await openMigrated(), {
            organisationSlug: opts.org,
            email,
            name: opts.name,
            role: opts.role,
            password,
            isPasswordForNewUserOnly: given === undefined,
          });
          const generated = given === undefined && result.isNewUser ? password : undefined;
          return {
            data: {
              user: { id: result.user.id, email: result.user.email, name: result.user.name },
              organisation: opts.org,
              role: result.role,
              isNewUser: result.isNewUser,
              ...(generated ? { generatedPassword: generated } : {}),
            },
            text:
              `${result.isNewUser ? "Created" : "Updated"} ${result.user.email} as ${result.role} in ${opts.org}.` +
              (generated ? `\nGenerated password (shown once): ${generated}` : ""),
          };
        },
      ),
    );

  program
    .command("import <file>")
    .description("import a CSV file (same path as an upload in the browser)")
    .requiredOption("--org <slug>", "organisation slug")
    .addOption(new Option("--kind <kind>", "data kind").choices(IMPORT_KINDS).makeOptionMandatory())
    .option("--mapping <file.json>", "column mapping: { canonical column: header in the file }")
    .addOption(
      new Option(
        "--date-order <order>",
        "how dates are written: day/month/year, month/day/year or year-month-day (needed when every date fits both of the first two)",
      ).choices(Object.keys(DATE_ORDERS)),
    )
    .action(
      action(async (file: string, opts: ImportCommandOptions) => {
        const started = performance.now();
        const db = await openMigrated();
        const org = await findOrganisationBySlug(db, opts.org);
        // The command line acts for the organisation with an admin's rights, as its operator.
        const scope = { organisationId: org.id, userId: null, role: "admin" as const };
        const { importId, inspection } = await receiveUpload(db, scope, {
          kind: opts.kind,
          fileName: basename(file),
          source: createReadStream(file),
        });
        // A file that cannot be imported as given is cancelled, so it can be uploaded again.
        const abandon = async (message: string) => {
          await cancelImport(db, scope, importId);
          return new Error(message);
        };
        let mapping = mappingByName(inspection.headers, inspection.mapping);
        let inspected = inspection;
        if (opts.mapping) {
          const given = z
            .record(z.string(), z.string().nullable())
            .parse(JSON.parse(await readFile(opts.mapping, "utf8")));
          mapping = { ...mapping, ...given };
          const problems = validateMapping(
            opts.kind,
            inspection.headers,
            mappingToIndexes(inspection.headers, mapping),
          );
          if (problems.length) throw await abandon(problems.join(" "));
          // Which columns hold dates may have changed: learn their order again.
          inspected = await inspectStoredImport(db, scope, importId, mapping);
        }
        const blocking = inspection.problems.filter(
          (p) => !opts.mapping || !/column|required/i.test(p),
        );
        if (blocking.length) throw await abandon(blocking.join(" "));
        const dates = resolveDateFormat(
          inspected,
          opts.dateOrder ? DATE_ORDERS[opts.dateOrder] : undefined,
        );
        if (!dates.ok) {
          throw await abandon(`${dates.message} Give --date-order dmy or --date-order mdy.`);
        }
        for (const notice of [...inspection.notices, ...inspected.readNotes]) log(notice);
        const { jobId } = await startImport(db, scope, importId, {
          delimiter: inspection.delimiter,
          headers: inspection.headers,
          mapping,
          read: { ...inspected.read, dateFormat: dates.dateFormat },
        });
        await startWorker({ db, jobId, isOneShot: true, log });
        const result = await getImport(db, scope, importId);
        if (result.status !== "done")
          throw new Error(`Import ${importId} ${result.status}: ${result.error ?? ""}`);
        const summary = {
          importId,
          rows: result.rowsTotal,
          imported: result.rowsImported,
          duplicates: result.rowsDuplicate,
          warnings: result.rowsWarning,
          rejected: result.rowsRejected,
          seconds: Math.round((performance.now() - started) / 10) / 100,
        };
        return {
          data: summary,
          text: `Import ${importId}: ${summary.rows} rows, ${summary.imported} imported, ${summary.duplicates} duplicates, ${summary.warnings} with warnings, ${summary.rejected} rejected (${summary.seconds} s)`,
        };
      }),
    );

  /** The organisation of --org, as its operator (admin rights) for the read commands. */
  const operatorScope = async (slug: string) => {
    const db = await openMigrated();
    const org = await findOrganisationBySlug(db, slug);
    return { db, org, scope: { organisationId: org.id, userId: null, role: "admin" as const } };
  };
  const positiveInt = (v: string) => z.coerce.number().int().positive().parse(v);

  program
    .command("recompute")
    .description("recompute the cohort × band × fault statistics and signals")
    .requiredOption("--org <slug>", "organisation slug")
    .action(
      action(async (opts: { org: string }) => {
        const { db, org } = await operatorScope(opts.org);
        const result = await recomputeOrganisation(db, org.id, log);
        return {
          data: result,
          text: `${org.slug}: ${result.cells} cells, ${result.signals} signals (${result.readingsIgnored} of ${result.readings} odometer readings ignored) in ${result.seconds.toFixed(1)} s`,
        };
      }),
    );

  /**
   * Ranked cells as text, each figure from the metric registry: in the organisation's unit, at
   * its run's confidence, in words (no ∞, no exponents).
   */
  const printCells = (cells: RankedCell[], ctx: MetricContext) =>
    cells.length === 0
      ? "No cells: run recompute first, or nothing matches."
      : [
          `"Likely" ranges are ${intervalLabel(ctx.confidence)}s.`,
          ...cells.map((c) => {
            const figures = cellOfRanked(c);
            const place = `${c.make} ${c.model} ${c.generation} · ${formatBand(c.bandFrom, c.bandTo, ctx.unit)} · ${c.faultName}${c.kind === "wear" ? " (wear)" : ""}`;
            const words = c.hasTooLittleData
              ? describeTooLittle(figures, ctx.unit)
              : `${sentence(describeCell(figures, ctx))} q ${formatProbability(c.qValue)}.`;
            return `${c.signal ? "SIGNAL " : "       "}${place}\n        ${words}`;
          }),
        ].join("\n");
  /** The organisation's unit and the confidence of its latest run. */
  const metricContext = async (
    db: Awaited<ReturnType<typeof operatorScope>>["db"],
    org: { distanceUnit: "mi" | "km" },
    scope: Awaited<ReturnType<typeof operatorScope>>["scope"],
  ): Promise<MetricContext> => ({
    unit: org.distanceUnit,
    confidence: (await getLatestRun(db, scope))?.confidenceLevel ?? 0.95,
  });

  const kindOption = () =>
    new Option("--kind <kind>", "failure cells, or wear cells (premature wear)")
      .choices(ANALYSED_KINDS)
      .default("failure");

  program
    .command("rank")
    .description("cells ranked by the lower bound of the rate ratio")
    .requiredOption("--org <slug>", "organisation slug")
    .option("--fault <dtc|component>", "only this DTC or component slug")
    .option("--limit <n>", "how many", positiveInt, 20)
    .addOption(kindOption())
    .action(
      action(async (opts: { org: string; fault?: string; limit: number; kind: AnalysedKind }) => {
        const { db, org, scope } = await operatorScope(opts.org);
        const { cells } = await listRankedCells(db, scope, {
          fault: opts.fault,
          kind: opts.kind,
          limit: opts.limit,
        });
        return { data: cells, text: printCells(cells, await metricContext(db, org, scope)) };
      }),
    );

  program
    .command("signals")
    .description("cells that stand out after false-discovery control")
    .requiredOption("--org <slug>", "organisation slug")
    .addOption(kindOption())
    .action(
      action(async (opts: { org: string; kind: AnalysedKind }) => {
        const { db, org, scope } = await operatorScope(opts.org);
        const { cells } = await listRankedCells(db, scope, {
          isSignalOnly: true,
          kind: opts.kind,
          limit: 10_000,
        });
        return { data: cells, text: printCells(cells, await metricContext(db, org, scope)) };
      }),
    );

  const components = program
    .command("components")
    .description("Recurra's component list and the organisation's kind of each");
  components
    .command("list")
    .description("every component with its kind (service, wear or failure) for the organisation")
    .requiredOption("--org <slug>", "organisation slug")
    .action(
      action(async (opts: { org: string }) => {
        const { db, scope } = await operatorScope(opts.org);
        const rows = (await listComponentKinds(db, scope)).map((c) => ({
          slug: c.slug,
          name: c.name,
          system: c.system,
          kind: c.kind,
        }));
        return {
          data: rows,
          text: rows
            .map((c) => `${c.kind.padEnd(8)} ${c.slug.padEnd(40)} ${c.system} → ${c.name}`)
            .join("\n"),
        };
      }),
    );
  components
    .command("set-kind <component> <kind>")
    .description("set the organisation's kind of a component (audited; queues a recompute)")
    .requiredOption("--org <slug>", "organisation slug")
    .action(
      action(async (slug: string, kind: string, opts: { org: string }) => {
        const parsed = z.enum(COMPONENT_KINDS).safeParse(kind);
        if (!parsed.success)
          throw new Error(`Kind must be one of ${COMPONENT_KINDS.join(", ")}, not "${kind}".`);
        const { db, scope } = await operatorScope(opts.org);
        const result = await setComponentKind(db, scope, slug, parsed.data);
        const c = result.component;
        return {
          data: {
            slug: c.slug,
            name: c.name,
            system: c.system,
            kind: c.kind,
            changed: result.isChanged,
            linesChanged: result.linesChanged,
          },
          text: result.isChanged
            ? `${c.slug} is now ${c.kind}: ${result.linesChanged} repair lines classified again; a recompute is queued.`
            : `${c.slug} is already ${c.kind}; nothing changed.`,
        };
      }),
    );

  program
    .command("refuel")
    .description("post-refuel stall test per cohort and per vehicle")
    .requiredOption("--org <slug>", "organisation slug")
    .option(
      "--window <miles>",
      "miles after a fill-up",
      (v) => z.coerce.number().positive().parse(v),
      20,
    )
    .action(
      action(async (opts: { org: string; window: number }) => {
        const { db, scope } = await operatorScope(opts.org);
        const result = await getRefuelAnalysis(db, scope, opts.window);
        const line = (
          name: string,
          r: {
            observed: number;
            expected: number;
            ratio: number;
            lower: number;
            upper: number;
            pValue: number;
            noFuelData: number;
          },
        ) =>
          `${name.padEnd(30)} observed ${String(r.observed).padStart(4)}  expected ${r.expected.toFixed(1).padStart(6)}  ratio ${Number.isFinite(r.ratio) ? r.ratio.toFixed(2) : "—"} (${r.lower.toFixed(2)}–${Number.isFinite(r.upper) ? r.upper.toFixed(2) : "∞"})  p ${r.pValue.toPrecision(2)}  no fuel data ${r.noFuelData}`;
        return {
          data: result,
          text: [
            line("whole fleet", result.fleet),
            ...result.cohorts.map((c) => line(`${c.make} ${c.model} ${c.generation}`, c)),
          ].join("\n"),
        };
      }),
    );

  program
    .command("stock")
    .description("parts stocking plan of the customer base")
    .requiredOption("--org <slug>", "organisation slug")
    .option(
      "--service-level <p>",
      "target share of periods with no shortage (0.8, 0.9, 0.95, 0.98, 0.99)",
      "0.95",
    )
    .option("--lead-days <n>", "lead time for every part (default: each part's own, else 7)")
    .option("--review-days <n>", "days between orders", "14")
    .option("--months <n>", "customer base: vehicles seen in the last N months", "12")
    .option("--cautious", "use the upper confidence bound of each failure rate")
    .action(
      action(
        async (opts: {
          org: string;
          serviceLevel: string;
          leadDays?: string;
          reviewDays: string;
          months: string;
          cautious?: boolean;
        }) => {
          const q = StockingQuery.safeParse({
            serviceLevel: opts.serviceLevel,
            leadDays: opts.leadDays,
            reviewDays: opts.reviewDays,
            months: opts.months,
            cautious: opts.cautious ? "1" : "0",
          });
          if (!q.success) throw new Error(q.error.issues[0]?.message ?? "Invalid options.");
          const { db, scope } = await operatorScope(opts.org);
          const plan = await getStockingPlan(db, scope, q.data);
          const data = plan.parts.map((p) => ({
            partNumber: p.partNumber,
            component: p.component,
            expectedDemand: Number(p.expectedDemand.toFixed(4)),
            stockLevel: p.stockLevel,
            onHand: p.onHand,
            reorder: p.reorder,
            /** The kinds of work behind the demand, largest first: "failure+service". */
            demandKind: demandKinds(p.demandByKind).join("+"),
          }));
          return {
            data,
            text:
              `${plan.vehicles} vehicles seen in the last ${q.data.months} months (as of ${plan.asOf}); service level ${q.data.serviceLevel}\n` +
              data
                .filter((p) => p.reorder > 0)
                .map(
                  (p) =>
                    `${p.partNumber.padEnd(12)} ${(p.component ?? "").padEnd(44)} demand ${p.expectedDemand.toFixed(2).padStart(7)}  level ${String(p.stockLevel).padStart(4)}  on hand ${String(p.onHand).padStart(4)}  reorder ${String(p.reorder).padStart(4)}`,
                )
                .join("\n"),
          };
        },
      ),
    );

  program
    .command("digest")
    .description(
      "send this week's digest to the members who opted in (once per week unless --force)",
    )
    .requiredOption("--org <slug>", "organisation slug")
    .option("--force", "send again even if this week's digest went out")
    .action(
      action(async (opts: { org: string; force?: boolean }) => {
        const { db, org } = await operatorScope(opts.org);
        const r = await sendDigest(db, org.id, { force: opts.force });
        return {
          data: {
            week: r.week,
            recipients: r.recipients,
            skipped: r.skipped,
            newSignals: r.digest.newSignals.length,
            stateChanges: r.digest.stateChanges.length,
            comebacks: r.digest.comebacks.length,
            atRisk: r.digest.atRisk.length,
          },
          text: r.skipped
            ? `${org.slug}: the digest of ${r.week} already went out (use --force to send again).`
            : `${org.slug}: digest of ${r.week} queued for ${r.recipients} members (${r.digest.newSignals.length} new signals, ${r.digest.stateChanges.length} state changes).`,
        };
      }),
    );

  const demo = program.command("demo").description("invented demo scenario");
  demo
    .command("load")
    .description("load the demo organisations, accounts and data (skips when already loaded)")
    .option("--reset", "delete the demo organisations and load them again")
    .option("--seed <n>", "random seed", (v) => z.coerce.number().int().parse(v))
    .action(
      action(async (opts: { reset?: boolean; seed?: number }) => {
        const db = await openMigrated();
        const summary = await loadDemo(db, { reset: opts.reset, seed: opts.seed, log });
        // The demo comes with its statistics computed, so every screen has something to show.
        if (summary.status === "loaded") {
          for (const slug of DEMO_ORG_SLUGS) {
            await recomputeOrganisation(db, (await findOrganisationBySlug(db, slug)).id, log);
          }
        }
        const lines = summary.organisations.map(
          (o) =>
            `  ${o.slug}: ${o.vehicles} vehicles, ${o.repairOrders} repair orders, ${o.faultEvents} fault events, ${o.fuelTransactions} fill-ups`,
        );
        return {
          data: summary,
          text: `${summary.status === "loaded" ? "Demo loaded" : "Demo already loaded (use --reset to reload)"} in ${(summary.millis / 1000).toFixed(1)} s\n${lines.join("\n")}`,
        };
      }),
    );
  return program;
}

await buildProgram().parseAsync(process.argv);
