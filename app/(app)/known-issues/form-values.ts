import "server-only";
import type { Db } from "@/db";
import {
  findSignalOfCell,
  getCohortChoices,
  type KnownIssueDetail,
} from "@/db/queries/known-issues";
import { faultKeyOf, getCellDetail, type CellKey } from "@/db/queries/patterns";
import { componentOfDtc } from "@/db/queries/reference";
import { getRefuelAnalysis, type RefuelSymptom } from "@/db/queries/refuel";
import type { OrgScope } from "@/db/queries/scope";
import { SYMPTOMS } from "@/db/schema/records";
import type {
  KnownIssueFormChoices,
  KnownIssueFormValues,
} from "@/components/known-issues/known-issue-form";
import { formatBand } from "@/lib/format";
import { describeCell, sentence, SHARE } from "@/lib/metrics";
import {
  describeAgainstChance,
  formatConfidence,
  formatPlain,
  formatProbability,
  formatRange,
  intervalLabel,
} from "@/lib/plain-words";
import { CAUTIONS, cautionsForComponent, SYMPTOM_LABELS } from "@/lib/known-issues";
import { milesToUnit, unitToMiles } from "@/lib/units";
import { CAUTION_KINDS } from "@/db/schema/known-issues";

const EMPTY: KnownIssueFormValues = {
  title: "",
  summary: "",
  mileageFrom: "",
  mileageTo: "",
  dtcCodes: "",
  componentSlug: "",
  checks: "",
  fixDescription: "",
  laborOperation: "",
  typicalHours: "",
  parts: "",
  cautionText: "",
  references: "",
  checked: [],
};

const whole = (mi: number | null, unit: "mi" | "km") =>
  mi === null ? "" : String(Math.round(milesToUnit(mi, unit)));

/** The choices of the known-issue form: the organisation's cohorts, symptoms, cautions, components. */
export async function formChoices(db: Db, scope: OrgScope, unit: "mi" | "km") {
  const c = await getCohortChoices(db, scope);
  const models = new Map<string, KnownIssueFormChoices["cohorts"][number]>();
  const group = (make: string, model: string) => {
    const key = `${make}|${model}`;
    let g = models.get(key);
    if (!g) {
      g = {
        make,
        model,
        options: [{ key: `cohort:${make}|${model}|*`, label: "all generations" }],
      };
      models.set(key, g);
    }
    return g;
  };
  for (const m of c.models) group(m.make, m.model);
  for (const g of c.generations) {
    group(g.make, g.model).options.push({
      key: `cohort:${g.make}|${g.model}|${g.id}`,
      label: `${g.label} (${g.yearFrom}–${g.yearTo})`,
    });
  }
  const systems = new Map<string, { slug: string; name: string }[]>();
  for (const k of c.components) {
    const list = systems.get(k.system) ?? [];
    list.push({ slug: k.slug, name: k.name });
    systems.set(k.system, list);
  }
  const choices: KnownIssueFormChoices = {
    unit,
    cohorts: [...models.values()].sort((a, b) =>
      `${a.make} ${a.model}`.localeCompare(`${b.make} ${b.model}`),
    ),
    symptoms: SYMPTOMS.map((s) => ({ slug: s, label: SYMPTOM_LABELS[s] })),
    cautions: CAUTION_KINDS.filter((k) => k !== "other").map((k) => ({ kind: k, ...CAUTIONS[k] })),
    components: [...systems.entries()].map(([system, items]) => ({ system, items })),
  };
  return { choices, generations: c.generations };
}

/** The form prefilled with an existing known issue (edit). */
export function valuesFromIssue(d: KnownIssueDetail, unit: "mi" | "km"): KnownIssueFormValues {
  return {
    knownIssueId: d.id,
    title: d.title,
    summary: d.summary ?? "",
    mileageFrom: whole(d.mileageFromMi, unit),
    mileageTo: whole(d.mileageToMi, unit),
    dtcCodes: d.dtcCodes.join(" "),
    componentSlug: d.component?.slug ?? "",
    checks: d.checks.join("\n"),
    fixDescription: d.fixDescription ?? "",
    laborOperation: d.laborOperation ?? "",
    typicalHours: d.typicalHours === null ? "" : String(d.typicalHours),
    parts: d.parts
      .map((p) => `${p.partNumber}${p.quantity > 1 ? ` x${p.quantity}` : ""}`)
      .join("\n"),
    cautionText: d.cautions.find((c) => c.kind === "other")?.text ?? "",
    references: d.references ?? "",
    checked: [
      ...d.cohorts.map((c) => `cohort:${c.make}|${c.model}|${c.generationId ?? "*"}`),
      ...d.symptoms.map((s) => `symptom:${s}`),
      ...d.cautions.map((c) => `caution:${c.kind}`),
    ],
  };
}

/**
 * The form prefilled from a computed cell (the drill-down's "start a known issue"): its cohort,
 * band, fault, the cautions of the fault's system, and the evidence in words.
 */
export async function valuesFromCell(
  db: Db,
  scope: OrgScope,
  key: CellKey,
  unit: "mi" | "km",
  generations: { id: number; make: string; model: string; label: string }[],
): Promise<KnownIssueFormValues | null> {
  const detail = await getCellDetail(db, scope, key);
  if (!detail) return null;
  const c = detail.cell;
  const fk = faultKeyOf(key.fault);
  let componentSlug = fk.startsWith("component:") ? fk.slice(10) : "";
  const dtc = fk.startsWith("dtc:") ? fk.slice(4) : "";
  // The component a generic code usually points at, for the cautions (reference data).
  if (dtc) componentSlug = (await componentOfDtc(db, dtc)) ?? "";
  const gen = generations.find(
    (g) => g.make === key.make && g.model === key.model && g.label === key.generation,
  );
  const signal = await findSignalOfCell(db, scope, { ...key, faultKey: fk });
  const band = formatBand(c.bandFromMi, c.bandToMi, unit);
  const ctx = { unit, confidence: detail.confidenceLevel };
  const evidence =
    `Started from the cell ${key.make} ${key.model} ${key.generation}, ${band}, ${detail.faultLabel}: ` +
    `${describeCell(c, ctx)} ${sentence(SHARE.describe(c, ctx))}.`;
  return {
    ...EMPTY,
    title: `${detail.faultLabel} on ${key.make} ${key.model} ${key.generation}, ${band}`.slice(
      0,
      160,
    ),
    summary: evidence,
    mileageFrom: whole(c.bandFromMi, unit),
    mileageTo: whole(c.bandToMi, unit),
    dtcCodes: dtc,
    componentSlug: fk.startsWith("component:") ? fk.slice(10) : "",
    signalId: signal?.id,
    checked: [
      `cohort:${key.make}|${key.model}|${gen?.id ?? "*"}`,
      ...cautionsForComponent(componentSlug).map((k) => `caution:${k}`),
    ],
  };
}

export const EMPTY_VALUES = EMPTY;

/**
 * The form prefilled from the refuel analysis (a cohort whose stalls or no-starts cluster after
 * fill-ups): the cohort, the symptoms, the fuel-vapour caution and the test's result in words.
 */
export async function valuesFromRefuel(
  db: Db,
  scope: OrgScope,
  key: { cohort: string; window: number; symptom: "both" | "stall" | "no-start" },
  unit: "mi" | "km",
  generations: { id: number; make: string; model: string; label: string }[],
): Promise<KnownIssueFormValues | null> {
  const symptoms: RefuelSymptom[] = key.symptom === "both" ? ["stall", "no-start"] : [key.symptom];
  const analysis = await getRefuelAnalysis(db, scope, unitToMiles(key.window, unit), {
    symptoms,
  });
  const c = analysis.cohorts.find((x) => x.key === key.cohort);
  if (!c) return null;
  const gen = generations.find(
    (g) => g.make === c.make && g.model === c.model && g.label === c.generation,
  );
  const what = symptoms.map((s) => SYMPTOM_LABELS[s].toLowerCase()).join("s and ") + "s";
  const summary =
    `Started from the refuel analysis: ${c.observed} of ${c.events} ${what} on ${c.make} ${c.model} ${c.generation} ` +
    `came within ${key.window} ${unit} of a fill-up, where chance predicts ${formatPlain(c.expected)}: ` +
    `${describeAgainstChance(c)} (at ${formatConfidence(analysis.confidence)} confidence; ` +
    `${intervalLabel(analysis.confidence)} ${formatRange(c.lower, c.upper)} times, one-sided p ${formatProbability(c.pValue)}; ` +
    `${c.noFuelData} events had no fuel data).`;
  return {
    ...EMPTY,
    title:
      `${what[0]!.toUpperCase()}${what.slice(1)} soon after fill-ups on ${c.make} ${c.model} ${c.generation}`.slice(
        0,
        160,
      ),
    summary,
    checked: [
      `cohort:${c.make}|${c.model}|${gen?.id ?? "*"}`,
      ...symptoms.map((s) => `symptom:${s}`),
      "caution:fuel-vapour",
    ],
  };
}
