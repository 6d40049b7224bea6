import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import escapeHtml from "escape-html";
import type { Db, DbOrTx } from "@/db";
import {
  components,
  generations,
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
  signals,
  users,
  vehicles,
  type KnownIssueState,
} from "@/db/schema";
import {
  CAUTIONS,
  isHighVoltageVehicle,
  canChangeState,
  STATE_LABELS,
  type KnownIssueInput,
} from "@/lib/known-issues";
import { getConfiguredBaseUrl } from "@/lib/env";
import { faultName } from "@/lib/plain-words";
import { unitToMiles } from "@/lib/units";
import { findUserName } from "./accounts";
import { recordAudit } from "./audit";
import { componentIdOfSlug as componentIdOf, listComponentCatalogue } from "./reference";
import { queueEmail } from "./email";
import { assertCan, ConflictError, inOrg, NotFoundError, orgWhere, type OrgScope } from "./scope";

export type KnownIssueListItem = {
  id: number;
  title: string;
  state: KnownIssueState;
  mileageFromMi: number | null;
  mileageToMi: number | null;
  dtcCodes: string[];
  /** The codes by their names ("P0496 — …"). */
  dtcNames: string[];
  component: string | null;
  cohorts: string[];
  confirmedFindings: number;
  notTheCause: number;
  updatedAt: string;
};

const splitCodes = (s: string | null) => (s ? s.split(/\s+/).filter(Boolean) : []);

/** A known issue's DTCs with their descriptions ("code<TAB>description" lines), by a sub-select. */
const DTC_DESCRIPTIONS = sql<
  string | null
>`(select group_concat(d.code || char(9) || d.description, char(10))
  from dtc_codes d
 where instr(' ' || coalesce(known_issues.dtc_codes, '') || ' ', ' ' || d.code || ' ') > 0)`;

/** The codes by their names, code first ("P0496 — …"), in the issue's order. */
function dtcNames(codes: string[], descriptions: string | null): string[] {
  const byCode = new Map(
    (descriptions ?? "").split("\n").map((l) => l.split("\t") as [string, string | undefined]),
  );
  return codes.map((code) => faultName({ dtc: code, dtcDescription: byCode.get(code) ?? null }));
}

/** The cohorts of a set of known issues as labels ("Aurel Kestrel K2", "Brindle Tern (all)"). */
async function cohortLabels(db: DbOrTx, scope: OrgScope, ids: number[]) {
  if (ids.length === 0) return new Map<number, string[]>();
  const rows = await db
    .select({
      issueId: knownIssueCohorts.knownIssueId,
      make: knownIssueCohorts.make,
      model: knownIssueCohorts.model,
      generation: generations.label,
    })
    .from(knownIssueCohorts)
    .leftJoin(generations, eq(generations.id, knownIssueCohorts.generationId))
    .where(orgWhere(knownIssueCohorts, scope, inArray(knownIssueCohorts.knownIssueId, ids)))
    .orderBy(asc(knownIssueCohorts.make), asc(knownIssueCohorts.model), asc(generations.label));
  const out = new Map<number, string[]>();
  for (const r of rows) {
    const list = out.get(r.issueId) ?? [];
    list.push(`${r.make} ${r.model} ${r.generation ?? "(all generations)"}`);
    out.set(r.issueId, list);
  }
  return out;
}

/** Known issues of the organisation, most recently changed first, optionally of one state. */
export async function listKnownIssues(
  db: Db,
  scope: OrgScope,
  filter: { state?: KnownIssueState } = {},
): Promise<KnownIssueListItem[]> {
  assertCan(scope, "known-issues:read");
  const rows = await db
    .select({
      id: knownIssues.id,
      title: knownIssues.title,
      state: knownIssues.state,
      mileageFromMi: knownIssues.mileageFromMi,
      mileageToMi: knownIssues.mileageToMi,
      dtcCodes: knownIssues.dtcCodes,
      dtcDescriptions: DTC_DESCRIPTIONS,
      componentSystem: components.system,
      componentName: components.name,
      createdAt: knownIssues.createdAt,
      updatedAt: knownIssues.updatedAt,
      confirmed: sql<number>`(select count(*) from known_issue_findings f
        where f.known_issue_id = known_issues.id and f.outcome = 'confirmed')`,
      notTheCause: sql<number>`(select count(*) from known_issue_findings f
        where f.known_issue_id = known_issues.id and f.outcome = 'not-the-cause')`,
    })
    .from(knownIssues)
    .leftJoin(components, eq(components.id, knownIssues.componentId))
    .where(
      orgWhere(knownIssues, scope, filter.state ? eq(knownIssues.state, filter.state) : undefined),
    )
    .orderBy(desc(sql`coalesce(${knownIssues.updatedAt}, ${knownIssues.createdAt})`));
  const cohorts = await cohortLabels(
    db,
    scope,
    rows.map((r) => r.id),
  );
  return rows.map((r) => ({
    id: r.id,
    title: r.title,
    state: r.state,
    mileageFromMi: r.mileageFromMi,
    mileageToMi: r.mileageToMi,
    dtcCodes: splitCodes(r.dtcCodes),
    dtcNames: dtcNames(splitCodes(r.dtcCodes), r.dtcDescriptions),
    component: r.componentName ? `${r.componentSystem} → ${r.componentName}` : null,
    cohorts: cohorts.get(r.id) ?? [],
    confirmedFindings: Number(r.confirmed),
    notTheCause: Number(r.notTheCause),
    updatedAt: r.updatedAt ?? r.createdAt,
  }));
}

/** Everything the detail page shows except the live evidence (see known-issue-evidence.ts). */
export async function getKnownIssue(db: Db, scope: OrgScope, id: number) {
  assertCan(scope, "known-issues:read");
  const [issue] = await db
    .select({
      issue: knownIssues,
      componentSlug: components.slug,
      componentSystem: components.system,
      componentName: components.name,
      dtcDescriptions: DTC_DESCRIPTIONS,
      createdByName: users.name,
    })
    .from(knownIssues)
    .leftJoin(components, eq(components.id, knownIssues.componentId))
    .leftJoin(users, eq(users.id, knownIssues.createdBy))
    .where(orgWhere(knownIssues, scope, eq(knownIssues.id, id)))
    .limit(1);
  if (!issue) return null;
  const [cohorts, checks, cautions, partRows, attachments, states, comments, watchers, findings] =
    await Promise.all([
      db
        .select({
          id: knownIssueCohorts.id,
          make: knownIssueCohorts.make,
          model: knownIssueCohorts.model,
          generationId: knownIssueCohorts.generationId,
          generation: generations.label,
          yearFrom: generations.yearFrom,
          yearTo: generations.yearTo,
          powertrain: generations.powertrain,
        })
        .from(knownIssueCohorts)
        .leftJoin(generations, eq(generations.id, knownIssueCohorts.generationId))
        .where(orgWhere(knownIssueCohorts, scope, eq(knownIssueCohorts.knownIssueId, id)))
        .orderBy(asc(knownIssueCohorts.make), asc(knownIssueCohorts.model)),
      db
        .select({ position: knownIssueChecks.position, text: knownIssueChecks.text })
        .from(knownIssueChecks)
        .where(orgWhere(knownIssueChecks, scope, eq(knownIssueChecks.knownIssueId, id)))
        .orderBy(asc(knownIssueChecks.position)),
      db
        .select({ kind: knownIssueCautions.kind, text: knownIssueCautions.text })
        .from(knownIssueCautions)
        .where(orgWhere(knownIssueCautions, scope, eq(knownIssueCautions.knownIssueId, id)))
        .orderBy(asc(knownIssueCautions.id)),
      db
        .select({
          partNumber: knownIssueParts.partNumber,
          quantity: knownIssueParts.quantity,
          description: parts.description,
          onHand: parts.onHand,
          unitCostCents: parts.unitCostCents,
        })
        .from(knownIssueParts)
        .leftJoin(parts, eq(parts.id, knownIssueParts.partId))
        .where(orgWhere(knownIssueParts, scope, eq(knownIssueParts.knownIssueId, id)))
        .orderBy(asc(knownIssueParts.id)),
      db
        .select({
          id: knownIssueAttachments.id,
          fileName: knownIssueAttachments.fileName,
          contentType: knownIssueAttachments.contentType,
          sizeBytes: knownIssueAttachments.sizeBytes,
          createdAt: knownIssueAttachments.createdAt,
          uploadedBy: users.name,
        })
        .from(knownIssueAttachments)
        .leftJoin(users, eq(users.id, knownIssueAttachments.uploadedBy))
        .where(orgWhere(knownIssueAttachments, scope, eq(knownIssueAttachments.knownIssueId, id)))
        .orderBy(asc(knownIssueAttachments.id)),
      db
        .select({
          fromState: knownIssueStates.fromState,
          toState: knownIssueStates.toState,
          reason: knownIssueStates.reason,
          createdAt: knownIssueStates.createdAt,
          userName: users.name,
        })
        .from(knownIssueStates)
        .leftJoin(users, eq(users.id, knownIssueStates.userId))
        .where(orgWhere(knownIssueStates, scope, eq(knownIssueStates.knownIssueId, id)))
        .orderBy(asc(knownIssueStates.createdAt), asc(knownIssueStates.id)),
      db
        .select({
          id: knownIssueComments.id,
          body: knownIssueComments.body,
          createdAt: knownIssueComments.createdAt,
          userName: users.name,
        })
        .from(knownIssueComments)
        .leftJoin(users, eq(users.id, knownIssueComments.userId))
        .where(orgWhere(knownIssueComments, scope, eq(knownIssueComments.knownIssueId, id)))
        .orderBy(asc(knownIssueComments.createdAt), asc(knownIssueComments.id)),
      db
        .select({ userId: knownIssueWatchers.userId, name: users.name })
        .from(knownIssueWatchers)
        .innerJoin(users, eq(users.id, knownIssueWatchers.userId))
        .where(orgWhere(knownIssueWatchers, scope, eq(knownIssueWatchers.knownIssueId, id))),
      db
        .select({
          id: knownIssueFindings.id,
          outcome: knownIssueFindings.outcome,
          vehicleId: knownIssueFindings.vehicleId,
          unitNumber: vehicles.unitNumber,
          vin: vehicles.vin,
          cause: knownIssueFindings.cause,
          correction: knownIssueFindings.correction,
          odometerMi: knownIssueFindings.odometerMi,
          createdAt: knownIssueFindings.createdAt,
          userName: users.name,
        })
        .from(knownIssueFindings)
        .leftJoin(users, eq(users.id, knownIssueFindings.userId))
        .leftJoin(
          vehicles,
          and(
            eq(vehicles.id, knownIssueFindings.vehicleId),
            eq(vehicles.organisationId, scope.organisationId),
          ),
        )
        .where(orgWhere(knownIssueFindings, scope, eq(knownIssueFindings.knownIssueId, id)))
        .orderBy(desc(knownIssueFindings.createdAt), desc(knownIssueFindings.id)),
    ]);
  const i = issue.issue;
  return {
    id: i.id,
    title: i.title,
    summary: i.summary,
    state: i.state,
    mileageFromMi: i.mileageFromMi,
    mileageToMi: i.mileageToMi,
    symptoms: splitCodes(i.symptoms),
    dtcCodes: splitCodes(i.dtcCodes),
    /** The codes by their names ("P0496 — …"). */
    dtcNames: dtcNames(splitCodes(i.dtcCodes), issue.dtcDescriptions),
    component: issue.componentSlug
      ? { slug: issue.componentSlug, system: issue.componentSystem, name: issue.componentName }
      : null,
    fixDescription: i.fixDescription,
    laborOperation: i.laborOperation,
    typicalHours: i.typicalHours,
    references: i.references,
    signalId: i.signalId,
    createdAt: i.createdAt,
    createdBy: issue.createdByName,
    updatedAt: i.updatedAt,
    cohorts,
    checks: checks.map((c) => c.text),
    // High voltage first whenever a cohort's generation is hybrid or electric, chosen or not.
    cautions: [
      ...(cohorts.some((c) => isHighVoltageVehicle(c)) &&
      !cautions.some((c) => c.kind === "high-voltage")
        ? [{ kind: "high-voltage" as const, text: null }]
        : []),
      ...cautions,
    ].map((c) => ({
      kind: c.kind,
      title: CAUTIONS[c.kind].title,
      text: c.kind === "other" ? (c.text ?? "") : (c.text ?? CAUTIONS[c.kind].text),
    })),
    parts: partRows,
    attachments,
    history: [
      ...states.map((s) => ({ type: "state" as const, ...s })),
      ...comments.map((c) => ({ type: "comment" as const, ...c })),
    ].sort((a, b) => a.createdAt.localeCompare(b.createdAt)),
    watchers,
    isWatching: watchers.some((w) => w.userId === scope.userId),
    findings,
    findingCounts: {
      confirmed: findings.filter((f) => f.outcome === "confirmed").length,
      notTheCause: findings.filter((f) => f.outcome === "not-the-cause").length,
    },
  };
}
export type KnownIssueDetail = NonNullable<Awaited<ReturnType<typeof getKnownIssue>>>;

/** Cohorts a known issue can name: the catalogue's generations, and each make · model as a whole. */
export async function getCohortChoices(db: Db, scope: OrgScope) {
  assertCan(scope, "known-issues:read");
  const gens = await db
    .select({
      id: generations.id,
      make: generations.make,
      model: generations.model,
      label: generations.label,
      yearFrom: generations.yearFrom,
      yearTo: generations.yearTo,
    })
    .from(generations)
    .where(orgWhere(generations, scope))
    .orderBy(asc(generations.make), asc(generations.model), asc(generations.yearFrom));
  const models = await db
    .selectDistinct({ make: vehicles.make, model: vehicles.model })
    .from(vehicles)
    .where(orgWhere(vehicles, scope))
    .orderBy(asc(vehicles.make), asc(vehicles.model));
  return { generations: gens, models, components: await listComponentCatalogue(db) };
}

/** The signal (if any) of a computed cell, to link a known issue started from it. */
export async function findSignalOfCell(
  db: Db,
  scope: OrgScope,
  key: { make: string; model: string; generation: string; band: number; faultKey: string },
) {
  assertCan(scope, "known-issues:read");
  const [row] = await db
    .select({ id: signals.id })
    .from(signals)
    .where(
      orgWhere(
        signals,
        scope,
        eq(signals.make, key.make),
        eq(signals.model, key.model),
        eq(signals.cohortLabel, key.generation),
        eq(signals.bandIndex, key.band),
        eq(signals.faultKey, key.faultKey),
      ),
    )
    .limit(1);
  return row ?? null;
}

/** Writes the parts of a known issue that live in child tables (replacing what was there). */
async function writeChildren(tx: DbOrTx, scope: OrgScope, id: number, input: KnownIssueInput) {
  for (const table of [
    knownIssueCohorts,
    knownIssueChecks,
    knownIssueCautions,
    knownIssueParts,
  ] as const) {
    await tx.delete(table).where(orgWhere(table, scope, eq(table.knownIssueId, id)));
  }
  if (input.cohorts.length > 0) {
    const genIds = input.cohorts.flatMap((c) => (c.generationId === null ? [] : [c.generationId]));
    if (genIds.length > 0) {
      const found = await tx
        .select({ id: generations.id })
        .from(generations)
        .where(orgWhere(generations, scope, inArray(generations.id, genIds)));
      if (found.length !== new Set(genIds).size) {
        throw new NotFoundError("A chosen generation is not in this organisation's catalogue.");
      }
    }
    await tx
      .insert(knownIssueCohorts)
      .values(input.cohorts.map((c) => inOrg(scope, { knownIssueId: id, ...c })));
  }
  if (input.checks.length > 0) {
    await tx
      .insert(knownIssueChecks)
      .values(
        input.checks.map((text, i) => inOrg(scope, { knownIssueId: id, position: i + 1, text })),
      );
  }
  if (input.cautions.length > 0) {
    await tx.insert(knownIssueCautions).values(
      input.cautions.map((kind) =>
        inOrg(scope, {
          knownIssueId: id,
          kind,
          text: kind === "other" ? input.cautionText : null,
        }),
      ),
    );
  }
  if (input.parts.length > 0) {
    const known = await tx
      .select({ id: parts.id, partNumber: parts.partNumber })
      .from(parts)
      .where(
        orgWhere(
          parts,
          scope,
          inArray(
            parts.partNumber,
            input.parts.map((p) => p.partNumber),
          ),
        ),
      );
    const idOf = new Map(known.map((p) => [p.partNumber, p.id]));
    await tx.insert(knownIssueParts).values(
      input.parts.map((p) =>
        inOrg(scope, {
          knownIssueId: id,
          partNumber: p.partNumber,
          quantity: p.quantity,
          partId: idOf.get(p.partNumber) ?? null,
        }),
      ),
    );
  }
}

/** Columns of the known_issues row from the form (mileage in the organisation's unit). */
function issueColumns(input: KnownIssueInput, unit: "mi" | "km", componentId: number | null) {
  return {
    title: input.title,
    summary: input.summary,
    mileageFromMi: input.mileageFrom === null ? null : unitToMiles(input.mileageFrom, unit),
    mileageToMi: input.mileageTo === null ? null : unitToMiles(input.mileageTo, unit),
    symptoms: input.symptoms.join(" ") || null,
    dtcCodes: input.dtcCodes.join(" ") || null,
    componentId,
    fixDescription: input.fixDescription,
    laborOperation: input.laborOperation,
    typicalHours: input.typicalHours,
    references: input.references,
  };
}

async function distanceUnitOf(tx: DbOrTx, scope: OrgScope): Promise<"mi" | "km"> {
  const [org] = await tx
    .select({ unit: organisations.distanceUnit })
    .from(organisations)
    .where(eq(organisations.id, scope.organisationId));
  return org?.unit ?? "mi";
}

/** Creates a known issue (state "watching"); its author watches it. */
export async function createKnownIssue(db: Db, scope: OrgScope, input: KnownIssueInput) {
  assertCan(scope, "known-issues:manage");
  return db.transaction(async (tx) => {
    const unit = await distanceUnitOf(tx, scope);
    const [created] = await tx
      .insert(knownIssues)
      .values(
        inOrg(scope, {
          ...issueColumns(input, unit, await componentIdOf(tx, input.componentSlug)),
          state: "watching" as const,
          signalId: input.signalId,
          createdBy: scope.userId,
        }),
      )
      .returning({ id: knownIssues.id });
    if (!created) throw new Error("createKnownIssue: insert returned no row");
    await writeChildren(tx, scope, created.id, input);
    if (input.signalId !== null) {
      // The signal it was started from now points at the known issue.
      await tx
        .update(signals)
        .set({ knownIssueId: created.id, state: "promoted" })
        .where(orgWhere(signals, scope, eq(signals.id, input.signalId)));
    }
    await tx.insert(knownIssueStates).values(
      inOrg(scope, {
        knownIssueId: created.id,
        fromState: null,
        toState: "watching" as const,
        reason: input.signalId ? "Started from a computed signal." : "Started by hand.",
        userId: scope.userId,
      }),
    );
    if (scope.userId !== null) {
      await tx
        .insert(knownIssueWatchers)
        .values(inOrg(scope, { knownIssueId: created.id, userId: scope.userId }))
        .onConflictDoNothing();
    }
    await recordAudit(tx, scope, {
      action: "known-issue.create",
      entity: "known_issue",
      entityId: created.id,
      detail: { title: input.title },
    });
    return created;
  });
}

async function requireIssue(tx: DbOrTx, scope: OrgScope, id: number) {
  const [row] = await tx
    .select({ id: knownIssues.id, title: knownIssues.title, state: knownIssues.state })
    .from(knownIssues)
    .where(orgWhere(knownIssues, scope, eq(knownIssues.id, id)))
    .limit(1);
  if (!row) throw new NotFoundError("No such known issue in this organisation.");
  return row;
}

export async function updateKnownIssue(
  db: Db,
  scope: OrgScope,
  id: number,
  input: KnownIssueInput,
) {
  assertCan(scope, "known-issues:manage");
  await db.transaction(async (tx) => {
    await requireIssue(tx, scope, id);
    const unit = await distanceUnitOf(tx, scope);
    await tx
      .update(knownIssues)
      .set({
        ...issueColumns(input, unit, await componentIdOf(tx, input.componentSlug)),
        updatedAt: sql`strftime('%Y-%m-%dT%H:%M:%fZ', 'now')`,
      })
      .where(orgWhere(knownIssues, scope, eq(knownIssues.id, id)));
    await writeChildren(tx, scope, id, input);
    await recordAudit(tx, scope, {
      action: "known-issue.update",
      entity: "known_issue",
      entityId: id,
      detail: { title: input.title },
    });
  });
}

/** The address to reach the watchers of a known issue, except the person who made the change. */
async function watcherAddresses(tx: DbOrTx, scope: OrgScope, id: number) {
  const rows = await tx
    .select({ email: users.email, userId: users.id })
    .from(knownIssueWatchers)
    .innerJoin(users, eq(users.id, knownIssueWatchers.userId))
    // Only people who are still members of the organisation hear about it.
    .innerJoin(
      memberships,
      and(
        eq(memberships.userId, knownIssueWatchers.userId),
        eq(memberships.organisationId, scope.organisationId),
      ),
    )
    .where(orgWhere(knownIssueWatchers, scope, eq(knownIssueWatchers.knownIssueId, id)));
  return rows.filter((r) => r.userId !== scope.userId).map((r) => r.email);
}

function baseUrl(): string {
  // Links in e-mail: RECURRA_BASE_URL or NEXTAUTH_URL (README, "Configuration").
  return getConfiguredBaseUrl() ?? "http://localhost:3000";
}

/** Moves a known issue to another state, with the reason; watchers get an e-mail. */
export async function changeKnownIssueState(
  db: Db,
  scope: OrgScope,
  input: { knownIssueId: number; toState: KnownIssueState; reason: string },
) {
  assertCan(scope, "known-issues:manage");
  return db.transaction(async (tx) => {
    const issue = await requireIssue(tx, scope, input.knownIssueId);
    if (issue.state === input.toState) {
      throw new ConflictError(
        `The known issue is already ${STATE_LABELS[issue.state].label.toLowerCase()}.`,
      );
    }
    if (!canChangeState(issue.state, input.toState)) {
      throw new ConflictError(
        `A ${STATE_LABELS[issue.state].label.toLowerCase()} known issue cannot move to ${STATE_LABELS[input.toState].label.toLowerCase()}.`,
      );
    }
    await tx
      .update(knownIssues)
      .set({ state: input.toState, updatedAt: sql`strftime('%Y-%m-%dT%H:%M:%fZ', 'now')` })
      .where(orgWhere(knownIssues, scope, eq(knownIssues.id, issue.id)));
    await tx.insert(knownIssueStates).values(
      inOrg(scope, {
        knownIssueId: issue.id,
        fromState: issue.state,
        toState: input.toState,
        reason: input.reason,
        userId: scope.userId,
      }),
    );
    const actor = scope.userId ? await findUserName(tx, scope.userId) : null;
    const from = STATE_LABELS[issue.state].label;
    const to = STATE_LABELS[input.toState].label;
    const link = `${baseUrl()}/known-issues/${issue.id}`;
    for (const to_ of await watcherAddresses(tx, scope, issue.id)) {
      await queueEmail(tx, {
        organisationId: scope.organisationId,
        to: to_,
        subject: `Known issue ${to.toLowerCase()}: ${issue.title}`,
        text: `${actor ?? "Someone"} moved "${issue.title}" from ${from} to ${to}.\n\nWhy: ${input.reason}\n\n${link}\n\nYou get this because you watch this known issue in Recurra.`,
        html: `<p>${escapeHtml(actor ?? "Someone")} moved <strong>${escapeHtml(issue.title)}</strong> from ${from} to <strong>${to}</strong>.</p><p>Why: ${escapeHtml(input.reason)}</p><p><a href="${link}">Open the known issue</a></p><p style="color:#666">You get this because you watch this known issue in Recurra.</p>`,
      });
    }
    await recordAudit(tx, scope, {
      action: "known-issue.state",
      entity: "known_issue",
      entityId: issue.id,
      detail: { from: issue.state, to: input.toState, reason: input.reason },
    });
  });
}

export async function addKnownIssueComment(
  db: Db,
  scope: OrgScope,
  input: { knownIssueId: number; body: string },
) {
  assertCan(scope, "known-issues:comment");
  await db.transaction(async (tx) => {
    await requireIssue(tx, scope, input.knownIssueId);
    await tx
      .insert(knownIssueComments)
      .values(
        inOrg(scope, { knownIssueId: input.knownIssueId, body: input.body, userId: scope.userId }),
      );
    await recordAudit(tx, scope, {
      action: "known-issue.comment",
      entity: "known_issue",
      entityId: input.knownIssueId,
    });
  });
}

/** Starts or stops watching a known issue (e-mail on state changes and matching vehicles). */
export async function setWatching(db: Db, scope: OrgScope, id: number, watching: boolean) {
  assertCan(scope, "known-issues:comment");
  if (scope.userId === null) throw new ConflictError("Only a signed-in person can watch.");
  const userId = scope.userId;
  await db.transaction(async (tx) => {
    await requireIssue(tx, scope, id);
    if (watching) {
      await tx
        .insert(knownIssueWatchers)
        .values(inOrg(scope, { knownIssueId: id, userId }))
        .onConflictDoNothing();
    } else {
      await tx
        .delete(knownIssueWatchers)
        .where(
          orgWhere(
            knownIssueWatchers,
            scope,
            eq(knownIssueWatchers.knownIssueId, id),
            eq(knownIssueWatchers.userId, userId),
          ),
        );
    }
    await recordAudit(tx, scope, {
      action: watching ? "known-issue.watch" : "known-issue.unwatch",
      entity: "known_issue",
      entityId: id,
    });
  });
}

/** Records an attachment already stored on disk (the route handler streams and checks it). */
export async function addKnownIssueAttachment(
  db: Db,
  scope: OrgScope,
  input: {
    knownIssueId: number;
    fileName: string;
    storedPath: string;
    contentType: string;
    sizeBytes: number;
  },
) {
  assertCan(scope, "known-issues:comment");
  return db.transaction(async (tx) => {
    await requireIssue(tx, scope, input.knownIssueId);
    const [row] = await tx
      .insert(knownIssueAttachments)
      .values(inOrg(scope, { ...input, uploadedBy: scope.userId }))
      .returning({ id: knownIssueAttachments.id });
    if (!row) throw new Error("addKnownIssueAttachment: insert returned no row");
    await recordAudit(tx, scope, {
      action: "known-issue.attach",
      entity: "known_issue",
      entityId: input.knownIssueId,
      detail: { fileName: input.fileName, sizeBytes: input.sizeBytes },
    });
    return row;
  });
}

export async function getKnownIssueAttachment(db: Db, scope: OrgScope, attachmentId: number) {
  assertCan(scope, "known-issues:read");
  const [row] = await db
    .select()
    .from(knownIssueAttachments)
    .where(orgWhere(knownIssueAttachments, scope, eq(knownIssueAttachments.id, attachmentId)))
    .limit(1);
  return row ?? null;
}
