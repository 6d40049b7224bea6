/**
 * The technician's lookup, pure parts: the query in the URL, the symptom read from words, and
 * the arithmetic that ranks likely causes for one vehicle (no I/O; db/queries/lookup.ts feeds it).
 */
import { z } from "zod";
import { SYMPTOMS, type Symptom } from "@/db/schema/records";
import { parseDtc, type DtcInfo } from "@/lib/dtc";
import { parseFormNumber } from "@/lib/form-number";
import { parseSymptom, symptomFromText } from "@/lib/import/symptoms";
import { intervalLabel } from "@/lib/plain-words";
import { wilsonInterval } from "@/lib/stats";

/** Fewer matching repair lines than this in the vehicle's band: widen to the whole cohort. */
export const MIN_LINES_IN_BAND = 10;

/** The ranking rule as the page states it (keep in step with compareCauses). */
export function rankingRule(confidence: number): string {
  return (
    `Ranked by the lower end of the ${intervalLabel(confidence)} of how often each was the cause ` +
    "(Wilson score interval, Wilson 1927), so that 1 of 1 does not outrank 9 of 12; ties by the share " +
    "itself, then by the count behind it. The share counts the organisation's repair lines of this " +
    "cohort in this mileage band that carry the entered codes or symptom, and how many of them were " +
    "fixed at this fault, plus the findings technicians recorded (this was the cause = yes, not the " +
    `cause = no). With fewer than ${MIN_LINES_IN_BAND} such lines in the band, the whole cohort is counted instead.`
  );
}

const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);
const optionalText = (max: number, label: string) =>
  z.preprocess(
    blankToUndefined,
    z.string().trim().max(max, `${label}: at most ${max} characters.`).optional(),
  );

/**
 * The lookup's GET parameters. Every field is optional on its own; the page asks for a VIN or a
 * unit number, or for the make, model and model year of a vehicle not on file, before it looks
 * anything up. Bad values get a message per field.
 */
export const LookupQuery = z.object({
  vin: optionalText(40, "VIN"),
  unit: optionalText(40, "Unit number"),
  make: optionalText(60, "Make"),
  model: optionalText(60, "Model"),
  year: z.preprocess(
    blankToUndefined,
    z.coerce
      .number({ error: "Model year: write a year, e.g. 2019." })
      .int("Model year: write a year, e.g. 2019.")
      .min(1980, "Model year: 1980 or later.")
      .max(2040, "Model year: 2040 or earlier.")
      .optional(),
  ),
  odometer: z.preprocess(
    // "61,250" and "61 250" read as 61250 (lib/form-number.ts); "61,25" is refused, not misread.
    (v) =>
      typeof v === "string" && v.trim() !== "" ? (parseFormNumber(v) ?? v) : blankToUndefined(v),
    z.coerce
      .number({ error: "Odometer: write a number, e.g. 61250." })
      .min(0, "Odometer: not below 0.")
      .max(2_000_000, "Odometer: at most 2,000,000.")
      .optional(),
  ),
  dtc: optionalText(200, "Codes"),
  words: optionalText(300, "Symptom words"),
  symptom: z.preprocess(
    blankToUndefined,
    z.enum(SYMPTOMS, { error: "Choose a symptom from the list." }).optional(),
  ),
});
export type LookupQuery = z.output<typeof LookupQuery>;

/**
 * The make, model and model year to look a vehicle not on file up by: the year typed in, else
 * the one its VIN codes (49 CFR 565, when that is unambiguous). Null unless all three are known.
 */
export function walkInOf(
  q: Pick<LookupQuery, "make" | "model" | "year">,
  vinModelYear: number | null | undefined,
): { make: string; model: string; year: number; isYearFromVin: boolean } | null {
  const year = q.year ?? vinModelYear ?? null;
  if (!q.make || !q.model || year === null) return null;
  return { make: q.make, model: q.model, year, isYearFromVin: q.year === undefined };
}

/** The codes typed in, each decoded (SAE J2012), and the tokens that are not codes. */
export function readCodes(raw: string | undefined): { codes: DtcInfo[]; invalid: string[] } {
  const codes: DtcInfo[] = [];
  const invalid: string[] = [];
  for (const token of (raw ?? "").split(/[\s,;]+/).filter(Boolean)) {
    const info = parseDtc(token);
    if (!info) invalid.push(token);
    else if (!codes.some((c) => c.code === info.code)) codes.push(info);
  }
  return { codes, invalid };
}

/**
 * The symptom of the lookup: the one chosen from the list, else the one Recurra's keyword rules
 * read from the words (the import's rules: lib/import/symptoms.ts); null when neither says.
 */
export function readSymptom(
  chosen: Symptom | undefined,
  words: string | undefined,
): { symptom: Symptom | null; source: "chosen" | "words" | null } {
  if (chosen) return { symptom: chosen, source: "chosen" };
  if (!words) return { symptom: null, source: null };
  const s = parseSymptom(words) ?? symptomFromText(words);
  return s === "other" ? { symptom: null, source: null } : { symptom: s, source: "words" };
}

/** One repair line of the vehicle's cohort, as the ranking reads it. */
export type LookupLine = {
  id: number;
  vehicleId: number;
  openedOn: string;
  odometerMi: number | null;
  componentSlug: string | null;
  symptom: string | null;
  codes: string[];
  /** The line was written by a recorded finding: the finding counts, not the line. */
  isFromFinding: boolean;
  laborHours?: number | null;
  partNumbers?: string | null;
  correction?: string | null;
};

/** What was fixed: a component, else DTCs (for a known issue that names no component). */
export type Fault = { component: string | null; dtcs: string[] };

/** Whether a repair line's fix was this fault: its component when the fault names one. */
export function isFixOf(line: Pick<LookupLine, "componentSlug" | "codes">, fault: Fault): boolean {
  if (fault.component) return line.componentSlug === fault.component;
  return line.codes.some((c) => fault.dtcs.includes(c));
}

/**
 * The repair lines the shares are counted on: lines (not written by findings) that carry one of
 * the entered codes or the symptom (every line when neither was entered), in the band
 * [fromMi, toMi); when fewer than `minLines` match there, the same lines over the whole cohort.
 */
export function selectMatchedLines<L extends LookupLine>(
  lines: L[],
  q: { codes: string[]; symptom: string | null; band: { fromMi: number; toMi: number } | null },
  minLines = MIN_LINES_IN_BAND,
): { lines: L[]; isWidened: boolean } {
  const hasCriteria = q.codes.length > 0 || q.symptom !== null;
  const matching = lines.filter(
    (l) =>
      !l.isFromFinding &&
      (!hasCriteria ||
        l.codes.some((c) => q.codes.includes(c)) ||
        (q.symptom !== null && l.symptom === q.symptom)),
  );
  if (!q.band) return { lines: matching, isWidened: true };
  const { fromMi, toMi } = q.band;
  const inBand = matching.filter(
    (l) => l.odometerMi !== null && l.odometerMi >= fromMi && l.odometerMi < toMi,
  );
  return inBand.length >= minLines
    ? { lines: inBand, isWidened: false }
    : { lines: matching, isWidened: true };
}

export type FindingCounts = { confirmed: number; notTheCause: number };

export type CauseShare = {
  /** Lines fixed at this fault, and recorded findings "this was the cause". */
  successes: number;
  trials: number;
  fromLines: { fixed: number; of: number };
  fromFindings: FindingCounts;
  /** Null when there is nothing to count (0 trials). */
  estimate: number | null;
  lower: number | null;
  upper: number | null;
};

/**
 * How often this fault was the cause: lines fixed at the fault out of the matched lines, plus
 * findings (confirmed = success, not the cause = failure), with a Wilson interval (Wilson 1927).
 */
export function causeShare(
  matched: Pick<LookupLine, "componentSlug" | "codes">[],
  fault: Fault,
  findings: FindingCounts = { confirmed: 0, notTheCause: 0 },
  confidence = 0.95,
): CauseShare {
  const fixed = matched.filter((l) => isFixOf(l, fault)).length;
  const successes = fixed + findings.confirmed;
  const trials = matched.length + findings.confirmed + findings.notTheCause;
  const interval = trials > 0 ? wilsonInterval(successes, trials, confidence) : null;
  return {
    successes,
    trials,
    fromLines: { fixed, of: matched.length },
    fromFindings: findings,
    estimate: interval?.estimate ?? null,
    lower: interval?.lower ?? null,
    upper: interval?.upper ?? null,
  };
}

/** The fix as the records write it, for a pattern cell with no known issue behind it. */
export function describeRecordedFix(fixLines: LookupLine[]): {
  typicalHours: number | null;
  parts: string[];
  correction: string | null;
} {
  const hours = fixLines
    .map((l) => l.laborHours)
    .filter((h): h is number => typeof h === "number" && h > 0)
    .sort((a, b) => a - b);
  const mid = Math.floor(hours.length / 2);
  const median =
    hours.length === 0
      ? null
      : hours.length % 2
        ? hours[mid]!
        : (hours[mid - 1]! + hours[mid]!) / 2;
  const most = (values: string[], n: number) => {
    const counts = new Map<string, number>();
    for (const v of values) counts.set(v, (counts.get(v) ?? 0) + 1);
    return [...counts.entries()]
      .sort((a, b) => b[1] - a[1] || a[0].localeCompare(b[0]))
      .slice(0, n)
      .map(([v]) => v);
  };
  return {
    typicalHours: median,
    parts: most(
      fixLines.flatMap((l) => (l.partNumbers ?? "").split(/[\s;,]+/).filter(Boolean)),
      3,
    ),
    correction:
      most(
        fixLines.flatMap((l) => (l.correction ? [l.correction] : [])),
        1,
      )[0] ?? null,
  };
}

/** A cause candidate: a known issue, or a computed cell of a component fault. */
export type Candidate<T = unknown> = {
  key: string;
  kind: "known-issue" | "cell";
  title: string;
  fault: Fault;
  share: CauseShare;
  data: T;
};

/**
 * A known issue absorbs the cells of its fault (its component, or one of its DTCs): those cells
 * are not listed again on their own. Returns the cells left over.
 */
export function absorbCells<C extends { fault: Fault }>(issues: { fault: Fault }[], cells: C[]) {
  return cells.filter(
    (cell) =>
      !issues.some(
        (i) =>
          (cell.fault.component !== null && cell.fault.component === i.fault.component) ||
          (cell.fault.component === null && cell.fault.dtcs.some((d) => i.fault.dtcs.includes(d))),
      ),
  );
}

/** Order of rankingRule: lower bound, then share, then trials, known issues before cells, title. */
export function compareCauses(a: Candidate, b: Candidate): number {
  const lo = (c: Candidate) => c.share.lower ?? -1;
  const est = (c: Candidate) => c.share.estimate ?? -1;
  return (
    lo(b) - lo(a) ||
    est(b) - est(a) ||
    b.share.trials - a.share.trials ||
    (a.kind === b.kind ? 0 : a.kind === "known-issue" ? -1 : 1) ||
    a.title.localeCompare(b.title)
  );
}

export function rankCauses<T>(candidates: Candidate<T>[]): Candidate<T>[] {
  return [...candidates].sort(compareCauses);
}
