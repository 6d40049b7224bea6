import { sql } from "drizzle-orm";
import type { Db } from "@/db";
import { getAtRiskVehicles } from "@/db/queries/at-risk";
import { queueEmail } from "@/db/queries/email";
import { listFaultNames } from "@/db/queries/reference";
import { getFixHeldSettings, listFixLines } from "@/db/queries/fix-held";
import { faultOfKey } from "@/lib/comeback-rates";
import { comebacksOf, fixHeld, type FixLine } from "@/lib/fix-held";
import { getConfiguredBaseUrl } from "@/lib/env";
import { STATE_LABELS } from "@/lib/known-issues";
import { buildDigestEmail, type Digest } from "@/lib/mail/digest-email";
import { faultName } from "@/lib/plain-words";
import { unitToMiles } from "@/lib/units";
import type { KnownIssueState } from "@/db/schema";
import { AT_RISK_HORIZON } from "@/lib/at-risk";

/** ISO week key such as "2026-W49" (ISO 8601: weeks start on Monday; week 1 holds 4 January). */
export function isoWeekKey(date: Date): string {
  const d = new Date(Date.UTC(date.getUTCFullYear(), date.getUTCMonth(), date.getUTCDate()));
  const day = d.getUTCDay() || 7;
  d.setUTCDate(d.getUTCDate() + 4 - day);
  const yearStart = Date.UTC(d.getUTCFullYear(), 0, 1);
  const week = Math.ceil(((d.getTime() - yearStart) / 86_400_000 + 1) / 7);
  return `${d.getUTCFullYear()}-W${String(week).padStart(2, "0")}`;
}

export type { Digest };

const whole = (mi: number, unit: "mi" | "km") =>
  Math.round(unit === "km" ? mi * 1.609344 : mi).toLocaleString("en-GB");

/**
 * What happened in an organisation since a date: signals first seen, known-issue state changes,
 * comebacks (the second visit inside the organisation's window) by fault, and the vehicles most
 * at risk now.
 */
export async function buildDigest(db: Db, organisationId: number, since: Date): Promise<Digest> {
  const sinceIso = since.toISOString();
  const [org] = await db.all<{
    id: number;
    name: string;
    distance_unit: "mi" | "km";
  }>(sql`select id, name, distance_unit from organisations where id = ${organisationId}`);
  if (!org) throw new Error(`buildDigest: no organisation ${organisationId}`);
  const unit = org.distance_unit;
  const signals = await db.all<{
    make: string;
    model: string;
    cohort_label: string;
    fault_key: string;
    band_index: number;
    events: number;
    rate_ratio: number | null;
    ratio_lower: number | null;
    ratio_upper: number | null;
    band_width_mi: number | null;
    dtc_description: string | null;
    component_system: string | null;
    component_name: string | null;
  }>(sql`
    select s.make, s.model, s.cohort_label, s.fault_key, s.band_index, s.events, s.rate_ratio,
           s.ratio_lower, s.ratio_upper,
           (select band_width_mi from analysis_runs r where r.id = s.last_run_id) as band_width_mi,
           d.description as dtc_description, k.system as component_system, k.name as component_name
      from signals s
      left join dtc_codes d on s.fault_key = 'dtc:' || d.code
      left join components k on s.fault_key = 'component:' || k.slug
     where s.organisation_id = ${organisationId} and s.created_at >= ${sinceIso} and s.state <> 'dismissed'
       and s.kind = 'failure'
     order by s.ratio_lower desc limit 20`);
  const states = await db.all<{
    title: string;
    from_state: KnownIssueState;
    to_state: KnownIssueState;
    reason: string;
    created_at: string;
  }>(sql`
    select k.title, s.from_state, s.to_state, s.reason, s.created_at
      from known_issue_states s join known_issues k on k.id = s.known_issue_id
     where s.organisation_id = ${organisationId} and s.from_state is not null and s.created_at >= ${sinceIso}
     order by s.created_at`);
  // Comebacks whose second visit falls in the period, by fault (the line's component, else its
  // first DTC), on failure lines only, paired and counted by lib/fix-held.ts as the comebacks
  // screen pairs them; each fault with how often its fix held across the organisation (the
  // figure the comebacks screen's per-fault row and a known issue of that fault show).
  const sinceDay = sinceIso.slice(0, 10);
  // Every failure line of the vehicles seen in the period: their comebacks can only pair these.
  const seenRows = await db.all<Record<string, unknown>>(sql`
    select l.id, l.vehicle_id, l.opened_on, l.odometer_mi, k.slug as component,
           (select group_concat(c.dtc, ' ') from visible_repair_line_codes c
             where c.repair_line_id = l.id) as codes
      from visible_repair_lines l left join components k on k.id = l.component_id
     where l.organisation_id = ${organisationId} and l.kind = 'failure'
       and l.vehicle_id in (select vehicle_id from visible_repair_lines
                             where organisation_id = ${organisationId} and kind = 'failure'
                               and opened_on >= ${sinceDay})`);
  const seen: FixLine[] = seenRows.map((r) => ({
    id: Number(r.id),
    vehicleId: Number(r.vehicle_id),
    openedOn: String(r.opened_on),
    odometerMi: r.odometer_mi === null ? null : Number(r.odometer_mi),
    kind: "failure",
    componentSlug: r.component === null ? null : String(r.component),
    codes: r.codes ? String(r.codes).split(" ").sort() : [],
  }));
  const faultKeys = [
    ...new Set(
      seen
        .filter((l) => l.openedOn >= sinceDay)
        .flatMap((l) =>
          l.componentSlug
            ? [`component:${l.componentSlug}`]
            : l.codes[0]
              ? [`dtc:${l.codes[0]}`]
              : [],
        ),
    ),
  ];
  const scope = { organisationId, userId: null, role: "admin" as const };
  const settings = await getFixHeldSettings(db, scope);
  const top = faultKeys
    .map((key) => ({
      key,
      count: comebacksOf(seen, faultOfKey(key), settings.window).filter(
        (c) => c.again.openedOn >= sinceDay,
      ).length,
    }))
    .filter((c) => c.count > 0)
    .sort((a, b) => b.count - a.count || a.key.localeCompare(b.key))
    .slice(0, 5);
  const names = await listFaultNames(
    db,
    top.map(({ key }) => {
      const f = faultOfKey(key);
      return { dtc: f.dtcs[0] ?? null, component: f.component };
    }),
  );
  const comebacks: Digest["comebacks"] = [];
  for (const { key, count } of top) {
    const fault = faultOfKey(key);
    const lines = await listFixLines(db, scope, { cohorts: "all", fault });
    comebacks.push({
      fault: names.get(key) ?? key,
      count,
      fixHeld: fixHeld(lines, fault, settings),
    });
  }
  const { rows, confidence } = await getAtRiskVehicles(
    db,
    { organisationId, userId: null, role: "admin" },
    { nextMiles: unitToMiles(AT_RISK_HORIZON, unit) },
  );
  return {
    organisation: { id: org.id, name: org.name, distanceUnit: unit },
    since: sinceDay,
    newSignals: signals.map((s) => {
      const width = s.band_width_mi ?? 25_000;
      const cohort = `${s.make} ${s.model} ${s.cohort_label}`;
      const fault = faultName({
        dtc: s.fault_key.startsWith("dtc:") ? s.fault_key.slice(4) : null,
        dtcDescription: s.dtc_description,
        componentSystem: s.component_system,
        componentName: s.component_name,
        faultKey: s.fault_key,
      });
      const number = (v: number | null) => (v === null ? null : Number(v));
      return {
        label: `${cohort} · ${fault}`,
        cohort,
        fault,
        band: `${whole(s.band_index * width, unit)}–${whole((s.band_index + 1) * width, unit)} ${unit}`,
        events: Number(s.events),
        ratio: number(s.rate_ratio),
        ratioLower: number(s.ratio_lower),
        ratioUpper: number(s.ratio_upper),
      };
    }),
    stateChanges: states.map((s) => ({
      title: s.title,
      from: STATE_LABELS[s.from_state].label,
      to: STATE_LABELS[s.to_state].label,
      reason: s.reason,
      at: s.created_at.slice(0, 10),
    })),
    comebacks,
    atRisk: rows.slice(0, 10).map((r) => ({
      vehicle: r.unitNumber ?? r.vin ?? `#${r.vehicleId}`,
      why: r.source.kind === "known-issue" ? r.source.title : `Signal: ${r.source.label}`,
      expected: r.expected,
      expectedLower: r.expectedLower,
      expectedUpper: r.expectedUpper,
    })),
    confidence,
  };
}

/** The digest as an e-mail (lib/mail/digest-email.ts), linking to the configured address. */
export function renderDigest(d: Digest): { subject: string; text: string; html: string } {
  return buildDigestEmail(d, getConfiguredBaseUrl() ?? "http://localhost:3000");
}

/**
 * Queues this week's digest to every member who opted in, once per organisation and ISO week
 * (a ledger entry in the audit log makes a second run, or a second web node, a no-op unless
 * forced).
 */
export async function sendDigest(
  db: Db,
  organisationId: number,
  opts: { now?: Date; force?: boolean } = {},
): Promise<{ week: string; recipients: number; skipped: boolean; digest: Digest }> {
  const now = opts.now ?? new Date();
  const week = isoWeekKey(now);
  const since = new Date(now.getTime() - 7 * 86_400_000);
  const digest = await buildDigest(db, organisationId, since);
  const mail = renderDigest(digest);
  return db.transaction(async (tx) => {
    const [already] = await tx.all<{ n: number }>(sql`
      select count(*) as n from audit_log where organisation_id = ${organisationId}
         and action = 'digest.sent' and entity_id = ${week}`);
    if (Number(already?.n) > 0 && !opts.force) {
      return { week, recipients: 0, skipped: true, digest };
    }
    const recipients = await tx.all<{ email: string }>(sql`
      select u.email from memberships m join users u on u.id = m.user_id
       where m.organisation_id = ${organisationId} and m.wants_digest = 1 and u.disabled_at is null
       order by u.email`);
    for (const r of recipients) {
      await queueEmail(tx, { organisationId, to: r.email, ...mail });
    }
    await tx.run(sql`insert into audit_log (organisation_id, action, entity, entity_id, detail)
      values (${organisationId}, 'digest.sent', 'digest', ${week}, ${JSON.stringify({ recipients: recipients.length })})`);
    return { week, recipients: recipients.length, skipped: false, digest };
  });
}
