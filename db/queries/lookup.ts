import "server-only";
import { eq, sql, type SQL } from "drizzle-orm";
import escapeHtml from "escape-html";
import type { Db } from "@/db";
import {
  knownIssueFindings,
  knownIssues,
  memberships,
  repairLineCodes,
  repairLines,
  repairOrders,
  users,
  vehicles,
  type Symptom,
} from "@/db/schema";
import { enqueueJob } from "@/jobs/queue";
import { lineKind } from "@/lib/component-kinds";
import { getComponentKind } from "./component-kinds";
import { refreshLastOdometers } from "./last-odometer";
import {
  cautionsForComponent,
  cautionsForWork,
  isHighVoltageVehicle,
  parseDtcList,
  SYMPTOM_LABELS,
  type FindingInput,
} from "@/lib/known-issues";
import {
  absorbCells,
  causeShare,
  describeRecordedFix,
  isFixOf,
  rankCauses,
  selectMatchedLines,
  type Candidate,
  type Fault,
  type FindingCounts,
  type LookupLine,
} from "@/lib/lookup";
import type { CellFigures, StoredCell } from "@/lib/cell-types";
import { fixHeld, type FixHeld } from "@/lib/fix-held";
import { faultName } from "@/lib/plain-words";
import { mileageBand } from "@/lib/stats";
import { formatDistance, unitToMiles } from "@/lib/units";
import { normaliseVin } from "@/lib/vin";
import { recordAudit } from "./audit";
import { componentIdOfSlug } from "./reference";
import { queueEmail } from "./email";
import { getKnownIssue, type KnownIssueDetail } from "./known-issues";
import { cellColumnsSql, FIGURE_COLUMNS_SQL, readCell, readFigures } from "./cell-rows";
import { getFixHeldSettings, getKnownIssueFixHeld } from "./fix-held";
import { assertCan, ConflictError, inOrg, NotFoundError, orgWhere, type OrgScope } from "./scope";

const num = (v: unknown): number | null => (v === null || v === undefined ? null : Number(v));

/** How many bare pattern cells the lookup lists at most (known issues are always listed). */
const MAX_CELLS = 6;

async function settingsOf(db: Db, scope: OrgScope) {
  const [s] = await db.all<{
    band_width: number;
    distance_unit: "mi" | "km";
    comeback_days: number;
    comeback_distance: number;
  }>(sql`select band_width, distance_unit, comeback_days, comeback_distance
           from organisations where id = ${scope.organisationId}`);
  if (!s) throw new NotFoundError("No such organisation.");
  const unit = s.distance_unit;
  // The comeback window, confidence and latest repair: the ones every fix-held figure reads.
  const fix = await getFixHeldSettings(db, scope);
  return {
    unit,
    bandWidthMi: unitToMiles(Number(s.band_width), unit),
    ...fix,
    comebackWindow: { days: Number(s.comeback_days), distance: Number(s.comeback_distance) },
  };
}

export type LookupVehicle = {
  /** Null for a vehicle not on file, looked up by make, model and model year (walkInVehicle). */
  id: number | null;
  vin: string | null;
  unitNumber: string | null;
  make: string;
  model: string;
  modelYear: number;
  generationId: number | null;
  generation: string | null;
  lastOdometerMi: number | null;
  lastOdometerOn: string | null;
  /** Hybrid or electric by its catalogue generation or its engine: high-voltage cautions. */
  isHighVoltage: boolean;
};

/**
 * The vehicle of the organisation with this VIN (normalised) or, failing that, this unit number.
 * Another organisation's vehicle is not found, exactly like a missing one.
 */
export async function findLookupVehicle(
  db: Db,
  scope: OrgScope,
  by: { vin?: string; unit?: string },
): Promise<LookupVehicle | null> {
  assertCan(scope, "lookup:use");
  const conds: SQL[] = [];
  if (by.vin) conds.push(sql`v.vin = ${normaliseVin(by.vin)}`);
  if (by.unit) conds.push(sql`v.unit_number = ${by.unit.trim()}`);
  if (conds.length === 0) return null;
  const rows = await db.all<Record<string, unknown>>(sql`
    select v.id, v.vin, v.unit_number, v.make, v.model, v.model_year, v.generation_id, g.label as generation,
           v.last_odometer_mi, v.last_odometer_on, v.engine, g.powertrain
      from vehicles v left join generations g on g.id = v.generation_id
     where v.organisation_id = ${scope.organisationId} and (${sql.join(conds, sql` or `)})
     order by case when ${by.vin ? sql`v.vin = ${normaliseVin(by.vin)}` : sql`0`} then 0 else 1 end
     limit 1`);
  const r = rows[0];
  if (!r) return null;
  return {
    id: Number(r.id),
    vin: r.vin === null ? null : String(r.vin),
    unitNumber: r.unit_number === null ? null : String(r.unit_number),
    make: String(r.make),
    model: String(r.model),
    modelYear: Number(r.model_year),
    generationId: num(r.generation_id),
    generation: r.generation === null ? null : String(r.generation),
    lastOdometerMi: num(r.last_odometer_mi),
    lastOdometerOn: r.last_odometer_on === null ? null : String(r.last_odometer_on),
    isHighVoltage: isHighVoltageVehicle({
      powertrain: r.powertrain === null ? null : String(r.powertrain),
      engine: r.engine === null ? null : String(r.engine),
    }),
  };
}

/**
 * A vehicle not on file, described by make, model and model year (a walk-in at a shop): the
 * make and model as the organisation's records spell them (compared without case, the most
 * common spelling first), and the generation of the organisation's catalogue that covers the
 * year, as an import would give it. Null when neither the vehicles nor the catalogue know the
 * make and model: there is no cohort to count.
 */
export async function walkInVehicle(
  db: Db,
  scope: OrgScope,
  by: { make: string; model: string; year: number; vin?: string },
): Promise<LookupVehicle | null> {
  assertCan(scope, "lookup:use");
  const org = scope.organisationId;
  const make = by.make.trim();
  const model = by.model.trim();
  const [named] = await db.all<{ make: string; model: string }>(sql`
    select make, model from (
      select make, model, count(*) as n from vehicles
       where organisation_id = ${org} and make = ${make} collate nocase and model = ${model} collate nocase
       group by make, model
      union all
      select make, model, 0 as n from generations
       where organisation_id = ${org} and make = ${make} collate nocase and model = ${model} collate nocase)
     order by n desc limit 1`);
  if (!named) return null;
  const [generation] = await db.all<{ id: number; label: string; powertrain: string | null }>(sql`
    select id, label, powertrain from generations
     where organisation_id = ${org} and make = ${named.make} collate nocase
       and model = ${named.model} collate nocase and ${by.year} between year_from and year_to
     order by year_from desc limit 1`);
  return {
    id: null,
    vin: by.vin ? normaliseVin(by.vin) : null,
    unitNumber: null,
    make: String(named.make),
    model: String(named.model),
    modelYear: by.year,
    generationId: generation ? Number(generation.id) : null,
    generation: generation ? String(generation.label) : null,
    lastOdometerMi: null,
    lastOdometerOn: null,
    isHighVoltage: isHighVoltageVehicle({ powertrain: generation?.powertrain ?? null }),
  };
}

/** Vehicles (alias v) of the same cohort as this one: its generation, else its model year. */
function cohortSql(v: LookupVehicle): SQL {
  return v.generationId !== null
    ? sql`(v.make = ${v.make} and v.model = ${v.model} and v.generation_id = ${v.generationId})`
    : sql`(v.make = ${v.make} and v.model = ${v.model} and v.generation_id is null and v.model_year = ${v.modelYear})`;
}

export type CauseCaution = { kind: string; title: string; text: string };

export type CauseResult = {
  key: string;
  kind: "known-issue" | "cell";
  title: string;
  knownIssue: {
    id: number;
    state: KnownIssueDetail["state"];
    summary: string | null;
    references: string | null;
  } | null;
  component: { slug: string; label: string } | null;
  dtcCodes: string[];
  share: Candidate["share"];
  checks: string[];
  fix: {
    description: string | null;
    laborOperation: string | null;
    typicalHours: number | null;
    parts: { partNumber: string; quantity: number; description: string | null }[];
    /** Where the fix comes from: the known issue, or what the repair records write. */
    source: "known-issue" | "records";
  };
  /** How often the fix held (lib/fix-held.ts): a known issue's own figure, as on its page. */
  fixHeld: FixHeld | null;
  cautions: CauseCaution[];
  /** The computed cell of this fault in the vehicle's cohort and band. */
  cell: LookupCell | null;
};

/** A computed cell of the vehicle's cohort and band, as the lookup shows it. */
export type LookupCell = CellFigures &
  Pick<StoredCell, "faultKey" | "dtc"> & {
    /** The component's slug (a DTC cell has none). */
    component: string | null;
    /** The fault by its name: "P0496 — …", "Fuel vapour → Purge valve". */
    faultName: string;
  };

export type LookupRequest = {
  vin?: string;
  unit?: string;
  /** A vehicle not on file: looked up by its cohort when the VIN and unit number find none. */
  walkIn?: { make: string; model: string; year: number };
  /** In the organisation's distance unit. */
  odometer?: number;
  codes: string[];
  symptom: Symptom | null;
};

/**
 * The lookup: the vehicle (within the organisation), its cohort and mileage band, and the known
 * issues and computed cells that fit, ranked by how often each was the cause (lib/lookup.ts,
 * rankingRule). Retired known issues are not offered; a known issue absorbs the cell of its
 * own fault.
 */
export async function getLookup(db: Db, scope: OrgScope, req: LookupRequest) {
  assertCan(scope, "lookup:use");
  const settings = await settingsOf(db, scope);
  const org = scope.organisationId;
  const codeInfo = req.codes.length
    ? await db.all<{ code: string; description: string }>(
        sql`select code, description from dtc_codes where code in (${sql.join(
          req.codes.map((c) => sql`${c}`),
          sql`, `,
        )})`,
      )
    : [];
  const descriptions = Object.fromEntries(codeInfo.map((c) => [c.code, c.description]));
  const onFile = await findLookupVehicle(db, scope, { vin: req.vin, unit: req.unit });
  const vehicle =
    onFile ?? (req.walkIn ? await walkInVehicle(db, scope, { ...req.walkIn, vin: req.vin }) : null);
  const base = { settings, descriptions, vehicle };
  if (!vehicle) {
    return {
      ...base,
      found: false as const,
      // Why: a VIN or unit number that names no vehicle, or a make and model nobody has.
      reason: req.walkIn && !onFile ? ("unknown-model" as const) : ("not-on-file" as const),
    };
  }

  const odometerMi =
    req.odometer !== undefined ? unitToMiles(req.odometer, settings.unit) : vehicle.lastOdometerMi;
  const isOdometerFromRecords = req.odometer === undefined && odometerMi !== null;
  const band = odometerMi === null ? null : mileageBand(odometerMi, settings.bandWidthMi);
  const cohortLabel = vehicle.generation ?? String(vehicle.modelYear);

  // Every failure line of the cohort, with its codes: the shares, fixes and comebacks read these
  // (scheduled service and wear are not causes of a complaint: lib/component-kinds.ts).
  const rows = await db.all<Record<string, unknown>>(sql`
    select l.id, l.vehicle_id, l.opened_on, l.odometer_mi, k.slug as component, l.symptom,
           l.labor_hours, l.part_numbers, l.correction,
           (select group_concat(rc.dtc, ' ') from visible_repair_line_codes rc where rc.repair_line_id = l.id) as codes,
           exists (select 1 from known_issue_findings f
                    where f.organisation_id = ${org} and f.repair_line_id = l.id) as from_finding
      from visible_repair_lines l
      join vehicles v on v.id = l.vehicle_id
      left join components k on k.id = l.component_id
     where l.organisation_id = ${scope.organisationId} and v.organisation_id = ${org} and l.kind = 'failure'
       and ${cohortSql(vehicle)}`);
  const lines: LookupLine[] = rows.map((r) => ({
    id: Number(r.id),
    vehicleId: Number(r.vehicle_id),
    openedOn: String(r.opened_on),
    odometerMi: num(r.odometer_mi),
    componentSlug: r.component === null ? null : String(r.component),
    symptom: r.symptom === null ? null : String(r.symptom),
    codes: r.codes ? String(r.codes).split(" ") : [],
    isFromFinding: Boolean(Number(r.from_finding)),
    laborHours: num(r.labor_hours),
    partNumbers: r.part_numbers === null ? null : String(r.part_numbers),
    correction: r.correction === null ? null : String(r.correction),
  }));
  const matched = selectMatchedLines(lines, {
    codes: req.codes,
    symptom: req.symptom,
    band: band ? { fromMi: band.from, toMi: band.to } : null,
  });

  // Known issues of this cohort whose mileage range meets the band; never retired ones.
  const issueIds = await db.all<{ id: number }>(sql`
    select ki.id from known_issues ki
     where ki.organisation_id = ${scope.organisationId} and ki.state <> 'retired'
       and exists (select 1 from known_issue_cohorts c
                    where c.organisation_id = ${org} and c.known_issue_id = ki.id
                      and c.make = ${vehicle.make} and c.model = ${vehicle.model}
                      and (c.generation_id is null ${vehicle.generationId !== null ? sql`or c.generation_id = ${vehicle.generationId}` : sql``}))
       ${band ? sql`and (ki.mileage_to_mi is null or ki.mileage_to_mi > ${band.from})` : sql``}
       ${band ? sql`and (ki.mileage_from_mi is null or ki.mileage_from_mi < ${band.to})` : sql``}
     order by ki.id`);
  const issues = (
    await Promise.all(issueIds.map((r) => getKnownIssue(db, scope, Number(r.id))))
  ).filter((d): d is KnownIssueDetail => d !== null);

  // Findings recorded on vehicles of this cohort (in the band, unless the count was widened).
  const findingRows = await db.all<{ known_issue_id: number; outcome: string; n: number }>(sql`
    select f.known_issue_id, f.outcome, count(*) as n
      from known_issue_findings f join vehicles v on v.id = f.vehicle_id
     where f.organisation_id = ${scope.organisationId} and v.organisation_id = ${org}
       and f.known_issue_id is not null and ${cohortSql(vehicle)}
       ${band && !matched.isWidened ? sql`and f.odometer_mi >= ${band.from} and f.odometer_mi < ${band.to}` : sql``}
     group by f.known_issue_id, f.outcome`);
  const findingsOf = (id: number): FindingCounts => ({
    confirmed: Number(
      findingRows.find((f) => Number(f.known_issue_id) === id && f.outcome === "confirmed")?.n ?? 0,
    ),
    notTheCause: Number(
      findingRows.find((f) => Number(f.known_issue_id) === id && f.outcome === "not-the-cause")
        ?.n ?? 0,
    ),
  });

  // The computed cells of this cohort and band: component cells are candidate causes, the
  // entered codes' own cells say how often the code itself comes up.
  const cellRows = band
    ? await db.all<Record<string, unknown>>(sql`
        select ${cellColumnsSql(["faultKey", "dtc"])}, ${FIGURE_COLUMNS_SQL}, r.confidence_level,
               k.slug, k.system as component_system, k.name as component_name,
               d.description as dtc_description
          from cell_stats c join analysis_runs r on r.id = c.run_id
          left join components k on k.id = c.component_id
          left join dtc_codes d on d.code = c.dtc
         where c.organisation_id = ${scope.organisationId} and c.make = ${vehicle.make}
           and c.model = ${vehicle.model} and c.cohort_label = ${cohortLabel}
           and c.band_index = ${band.index} and c.kind = 'failure' and c.fault_key <> 'all'`)
    : [];
  const cells: LookupCell[] = cellRows.map((r) => {
    const place = readCell(r, ["faultKey", "dtc"]);
    return {
      ...place,
      ...readFigures(r),
      component: r.slug === null ? null : String(r.slug),
      faultName: faultName({
        dtc: place.dtc,
        dtcDescription: r.dtc_description === null ? null : String(r.dtc_description),
        componentSystem: r.component_system === null ? null : String(r.component_system),
        componentName: r.component_name === null ? null : String(r.component_name),
        faultKey: place.faultKey,
      }),
    };
  });
  // The confidence of the cells' run (their intervals'), else the organisation's.
  const cellConfidence = cellRows[0] ? Number(cellRows[0].confidence_level) : settings.confidence;
  const componentCell = (slug: string | null) =>
    slug ? (cells.find((c) => c.component === slug) ?? null) : null;

  const issueCandidates: Candidate<KnownIssueDetail>[] = issues.map((d) => {
    const fault: Fault = { component: d.component?.slug ?? null, dtcs: d.dtcCodes };
    return {
      key: `known-issue:${d.id}`,
      kind: "known-issue",
      title: d.title,
      fault,
      share: causeShare(matched.lines, fault, findingsOf(d.id), settings.confidence),
      data: d,
    };
  });
  const cellCandidates = absorbCells(
    issueCandidates,
    cells
      .filter((c) => c.component !== null && c.events > 0)
      .map((c) => ({ cell: c, fault: { component: c.component, dtcs: [] } as Fault })),
  )
    .map(({ cell, fault }): Candidate<LookupCell> => ({
      key: cell.faultKey,
      kind: "cell",
      title: cell.faultName,
      fault,
      share: causeShare(matched.lines, fault, undefined, settings.confidence),
      data: cell,
    }))
    // A cell is offered as a cause only when it was the fix of at least one matching line.
    .filter((c) => c.share.fromLines.fixed > 0);
  const ranked = rankCauses<KnownIssueDetail | LookupCell>([
    ...issueCandidates,
    ...rankCauses(cellCandidates).slice(0, MAX_CELLS),
  ]);

  // How often the fix held: a known issue's own figure (the one its page shows); for a computed
  // pattern, the same definition over the cohort's failure lines.
  const cohortFixLines = lines.map((l) => ({ ...l, kind: "failure" as const }));
  const causes: CauseResult[] = [];
  for (const c of ranked) {
    const held =
      c.kind === "known-issue"
        ? await getKnownIssueFixHeld(db, scope, c.data as KnownIssueDetail)
        : fixHeld(cohortFixLines, c.fault, settings);
    const cellOut = c.kind === "cell" ? (c.data as LookupCell) : componentCell(c.fault.component);
    if (c.kind === "known-issue") {
      const d = c.data as KnownIssueDetail;
      causes.push({
        key: c.key,
        kind: c.kind,
        title: c.title,
        knownIssue: { id: d.id, state: d.state, summary: d.summary, references: d.references },
        component: d.component
          ? { slug: d.component.slug, label: `${d.component.system} → ${d.component.name}` }
          : null,
        dtcCodes: d.dtcCodes,
        share: c.share,
        checks: d.checks,
        fix: {
          description: d.fixDescription,
          laborOperation: d.laborOperation,
          typicalHours: d.typicalHours,
          parts: d.parts.map((p) => ({
            partNumber: p.partNumber,
            quantity: p.quantity,
            description: p.description,
          })),
          source: "known-issue" as const,
        },
        fixHeld: held,
        cautions: cautionsForWork(
          d.cautions.filter((k) => k.kind !== "other").map((k) => k.kind),
          vehicle,
        ).concat(d.cautions.filter((k) => k.kind === "other")),
        cell: cellOut,
      });
      continue;
    }
    const recorded = describeRecordedFix(lines.filter((l) => isFixOf(l, c.fault)));
    causes.push({
      key: c.key,
      kind: c.kind,
      title: c.title,
      knownIssue: null,
      component: c.fault.component ? { slug: c.fault.component, label: c.title } : null,
      dtcCodes: [],
      share: c.share,
      checks: [],
      fix: {
        description: recorded.correction,
        laborOperation: null,
        typicalHours: recorded.typicalHours,
        parts: recorded.parts.map((p) => ({ partNumber: p, quantity: 1, description: null })),
        source: "records" as const,
      },
      fixHeld: held,
      cautions: cautionsForWork(cautionsForComponent(c.fault.component), vehicle),
      cell: cellOut,
    });
  }

  return {
    ...base,
    found: true as const,
    vehicle,
    cohort: `${vehicle.make} ${vehicle.model} ${cohortLabel}`,
    odometerMi,
    isOdometerFromRecords,
    band: band ? { index: band.index, fromMi: band.from, toMi: band.to } : null,
    matchedLines: matched.lines.length,
    isWidened: matched.isWidened,
    codeCells: cells.filter((c) => c.dtc !== null && req.codes.includes(c.dtc)),
    cellConfidence,
    causes,
  };
}
export type LookupResult = Awaited<ReturnType<typeof getLookup>>;

/**
 * Records what a technician found, as part of the repair record, in one transaction: the
 * finding, a repair order and line for the vehicle at that odometer today (RO number F-<id>),
 * its codes, the audit entry, a recompute of the organisation's statistics, and, when a
 * confirmed known issue was the cause, an e-mail to its watchers.
 */
export async function recordFinding(db: Db, scope: OrgScope, input: FindingInput) {
  assertCan(scope, "findings:record");
  const codes = parseDtcList(input.dtcCodes).codes;
  return db.transaction(async (tx) => {
    const [vehicle] = await tx
      .select({
        id: vehicles.id,
        vin: vehicles.vin,
        unitNumber: vehicles.unitNumber,
        make: vehicles.make,
        model: vehicles.model,
        lastOdometerMi: vehicles.lastOdometerMi,
      })
      .from(vehicles)
      .where(orgWhere(vehicles, scope, eq(vehicles.id, input.vehicleId)))
      .limit(1);
    if (!vehicle) throw new NotFoundError("No such vehicle in this organisation.");
    const [issue] =
      input.knownIssueId === undefined
        ? []
        : await tx
            .select({
              id: knownIssues.id,
              title: knownIssues.title,
              state: knownIssues.state,
              componentId: knownIssues.componentId,
              fixDescription: knownIssues.fixDescription,
              laborOperation: knownIssues.laborOperation,
            })
            .from(knownIssues)
            .where(orgWhere(knownIssues, scope, eq(knownIssues.id, input.knownIssueId)))
            .limit(1);
    if (input.knownIssueId !== undefined && !issue) {
      throw new NotFoundError("No such known issue in this organisation.");
    }
    if (issue?.state === "retired") {
      throw new ConflictError("This known issue is retired; record the finding as something else.");
    }
    // A component named as the cause (a computed pattern, not a known issue).
    // (An unknown slug is refused: NotFoundError.)
    const namedComponentId = await componentIdOfSlug(tx, input.componentSlug ?? null);
    const [org] = await tx.all<{ distance_unit: "mi" | "km" }>(
      sql`select distance_unit from organisations where id = ${scope.organisationId}`,
    );
    const unit = org?.distance_unit ?? "mi";
    const odometerMi =
      input.odometer !== undefined ? unitToMiles(input.odometer, unit) : vehicle.lastOdometerMi;
    const isConfirmed = input.outcome === "confirmed";
    const cause =
      input.cause ?? (issue ? (isConfirmed ? issue.title : `Not the cause: ${issue.title}`) : null);
    const correction = input.correction ?? (isConfirmed ? (issue?.fixDescription ?? null) : null);
    const [finding] = await tx
      .insert(knownIssueFindings)
      .values(
        inOrg(scope, {
          knownIssueId: issue?.id ?? null,
          vehicleId: vehicle.id,
          outcome: input.outcome,
          cause,
          correction,
          odometerMi,
          userId: scope.userId,
        }),
      )
      .returning({ id: knownIssueFindings.id });
    if (!finding) throw new Error("recordFinding: insert returned no row");
    const today = new Date().toISOString().slice(0, 10);
    const roNumber = `F-${finding.id}`;
    const [actor] =
      scope.userId === null
        ? []
        : await tx
            .select({ name: users.name })
            .from(users)
            .innerJoin(memberships, eq(memberships.userId, users.id))
            .where(orgWhere(memberships, scope, eq(users.id, scope.userId)));
    const [order] = await tx
      .insert(repairOrders)
      .values(
        inOrg(scope, {
          vehicleId: vehicle.id,
          roNumber,
          openedOn: today,
          closedOn: today,
          odometerMi,
        }),
      )
      .returning({ id: repairOrders.id });
    if (!order) throw new Error("recordFinding: order insert returned no row");
    const complaint =
      input.complaint ??
      (input.symptom ? SYMPTOM_LABELS[input.symptom] : null) ??
      (codes.length ? `Codes ${codes.join(", ")}` : "Recorded from a lookup");
    const lineComponentId = isConfirmed ? (issue?.componentId ?? null) : namedComponentId;
    // What was found is not scheduled work: the line's kind is its component's (failure without one).
    const componentKind =
      lineComponentId === null ? null : await getComponentKind(tx, scope, lineComponentId);
    const [line] = await tx
      .insert(repairLines)
      .values(
        inOrg(scope, {
          repairOrderId: order.id,
          vehicleId: vehicle.id,
          lineNo: 1,
          openedOn: today,
          odometerMi,
          complaint,
          cause,
          correction,
          dtcCodes: codes.join(" ") || null,
          componentId: lineComponentId,
          kind: lineKind(componentKind, false),
          symptom: input.symptom ?? null,
          technician: actor?.name ?? null,
        }),
      )
      .returning({ id: repairLines.id });
    if (!line) throw new Error("recordFinding: line insert returned no row");
    if (codes.length > 0) {
      await tx
        .insert(repairLineCodes)
        .values(
          codes.map((dtc) => inOrg(scope, { repairLineId: line.id, vehicleId: vehicle.id, dtc })),
        );
    }
    await tx
      .update(knownIssueFindings)
      .set({ repairLineId: line.id })
      .where(orgWhere(knownIssueFindings, scope, eq(knownIssueFindings.id, finding.id)));
    // The finding's repair order is a dated reading like any other.
    await refreshLastOdometers(tx, scope, { vehicleIds: [vehicle.id] });
    await recordAudit(tx, scope, {
      action: "finding.record",
      entity: "known_issue_finding",
      entityId: finding.id,
      detail: {
        outcome: input.outcome,
        knownIssueId: issue?.id ?? null,
        componentSlug: input.componentSlug ?? null,
        vehicleId: vehicle.id,
        roNumber,
        repairLineId: line.id,
      },
    });
    await enqueueJob(tx, {
      kind: "recompute",
      organisationId: scope.organisationId,
      payload: { organisationId: scope.organisationId },
    });
    let emailed = 0;
    if (isConfirmed && issue?.state === "confirmed") {
      const watchers = await tx.all<{ email: string; user_id: number }>(sql`
        select u.email, u.id as user_id from known_issue_watchers w
          join users u on u.id = w.user_id
          join memberships m on m.user_id = w.user_id and m.organisation_id = w.organisation_id
         where w.organisation_id = ${scope.organisationId} and w.known_issue_id = ${issue.id}
           and u.disabled_at is null`);
      const who = vehicle.vin ?? vehicle.unitNumber ?? `vehicle #${vehicle.id}`;
      const at = odometerMi === null ? "" : ` at ${formatDistance(odometerMi, unit)}`;
      const link = `${baseUrl()}/known-issues/${issue.id}`;
      for (const w of watchers.filter((w) => Number(w.user_id) !== scope.userId)) {
        await queueEmail(tx, {
          organisationId: scope.organisationId,
          to: w.email,
          subject: `A vehicle matched a confirmed known issue: ${issue.title}`,
          text: `${actor?.name ?? "A technician"} found "${issue.title}" to be the cause on ${vehicle.make} ${vehicle.model} ${who}${at} (repair order ${roNumber}).\n\n${link}\n\nYou get this because you watch this known issue in Recurra.`,
          html: `<p>${escapeHtml(actor?.name ?? "A technician")} found <strong>${escapeHtml(issue.title)}</strong> to be the cause on ${escapeHtml(`${vehicle.make} ${vehicle.model} ${who}${at}`)} (repair order ${escapeHtml(roNumber)}).</p><p><a href="${link}">Open the known issue</a></p><p style="color:#666">You get this because you watch this known issue in Recurra.</p>`,
        });
        emailed++;
      }
    }
    return { findingId: finding.id, roNumber, repairLineId: line.id, emailed };
  });
}

function baseUrl(): string {
  return (
    process.env.RECURRA_BASE_URL ??
    process.env.NEXTAUTH_URL ??
    "http://localhost:3000"
  ).replace(/\/$/, "");
}
