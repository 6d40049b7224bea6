import type { Metadata } from "next";
import Link from "next/link";
import {
  ComponentFindingForm,
  KnownIssueFindingForm,
  SomethingElseForm,
  type FindingContext,
} from "@/components/lookup/finding-forms";
import { PrintButton } from "@/components/lookup/print-button";
import { buttonClass, inputClass } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { Panel } from "@/components/ui/panel";
import { CautionList } from "@/components/ui/caution-list";
import { SafetyNote } from "@/components/ui/safety-note";
import { getDb } from "@/db";
import { getLookup, type CauseResult, type LookupResult } from "@/db/queries/lookup";
import { SYMPTOMS } from "@/db/schema/records";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/roles";
import { formatBand, formatInterval, formatSig, ratePerTenThousand } from "@/lib/format";
import { SYMPTOM_LABELS, STATE_LABELS } from "@/lib/known-issues";
import { LookupQuery, RANKING_RULE, readCodes, readSymptom, walkInOf } from "@/lib/lookup";
import { formatDistance } from "@/lib/units";
import { checkVin, type VinCheck } from "@/lib/vin";
import { queryValues, type PageSearchParams } from "@/lib/search-params";

export const metadata: Metadata = { title: "Lookup" };

/** How many causes the printed sheet carries (the rest stay on screen). */
const PRINTED_CAUSES = 3;

const PRINT_CSS = `@media print {
  @page { size: auto; margin: 10mm; }
  html { font-size: 10.5px; }
  main { max-width: none !important; padding: 0 !important; }
}`;

/** A text field of the lookup form: its query name, label, hint and input attributes. */
type QueryFieldSpec = {
  name: string;
  label: string;
  hint?: string;
} & React.InputHTMLAttributes<HTMLInputElement>;

const NO_AUTOFILL = { autoComplete: "off" } as const;
const CODE_LIKE = { autoComplete: "off", spellCheck: false } as const;

/** The vehicle, odometer, codes and words (the select of symptoms follows them). */
const VEHICLE_FIELDS = (unit: "mi" | "km"): QueryFieldSpec[] => [
  { name: "vin", label: "VIN", hint: "17 characters; check digit per 49 CFR 565", ...CODE_LIKE },
  { name: "unit", label: "Unit number", hint: "When there is no VIN to hand", ...NO_AUTOFILL },
  {
    name: "odometer",
    label: `Odometer (${unit})`,
    hint: "Blank: the latest reading on record",
    inputMode: "numeric",
  },
  {
    name: "dtc",
    label: "Codes (DTCs)",
    hint: "Separated by spaces or commas, e.g. P0496 P0441",
    ...CODE_LIKE,
  },
  { name: "words", label: "Symptom, in words", hint: "e.g. stalls just after filling up" },
];

/** A vehicle not on file, by its cohort. */
const WALK_IN_FIELDS: QueryFieldSpec[] = [
  { name: "make", label: "Make", ...NO_AUTOFILL },
  { name: "model", label: "Model", ...NO_AUTOFILL },
  {
    name: "year",
    label: "Model year",
    hint: "Blank: the year the VIN codes, if it does",
    inputMode: "numeric",
  },
];

/** The fields, each with the value and errors of its name. */
function queryFields(
  specs: QueryFieldSpec[],
  raw: Record<string, string | undefined>,
  errors: Record<string, string[]>,
) {
  return specs.map((spec) => (
    <QueryField
      key={spec.name}
      {...spec}
      defaultValue={raw[spec.name]}
      errors={errors[spec.name]}
    />
  ));
}

const pct = (x: number | null) => (x === null ? "—" : `${Math.round(x * 100)}%`);

export default async function LookupPage({ searchParams }: { searchParams: PageSearchParams }) {
  const auth = await requirePage("lookup:use");
  const raw = await queryValues(searchParams);
  const parsed = LookupQuery.safeParse(raw);
  const errors: Record<string, string[]> = {};
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const key = String(issue.path[0] ?? "form");
      (errors[key] ??= []).push(issue.message);
    }
  }
  const q = parsed.success ? parsed.data : null;
  const unit = auth.organisation.distanceUnit;
  const codes = readCodes(q?.dtc);
  if (codes.invalid.length > 0) {
    (errors.dtc ??= []).push(
      `Not a diagnostic trouble code (SAE J2012: a letter P, C, B or U, a digit 0–3, then three hexadecimal characters, e.g. P0496): ${codes.invalid.join(", ")}.`,
    );
  }
  const symptom = readSymptom(q?.symptom, q?.words);
  const vinCheck = q?.vin ? checkVin(q.vin) : null;
  // A vehicle not on file: make, model and the model year (typed, or coded in its VIN).
  const walkIn = q ? walkInOf(q, vinCheck?.modelYear) : null;
  const hasVehicle = Boolean(q?.vin || q?.unit || walkIn);
  const isWalkInPartial = Boolean(q && !walkIn && (q.make || q.model || q.year !== undefined));
  const result =
    q && hasVehicle
      ? await getLookup(await getDb(), auth, {
          vin: q.vin,
          unit: q.unit,
          walkIn: walkIn ?? undefined,
          odometer: q.odometer,
          codes: codes.codes.map((c) => c.code),
          symptom: symptom.symptom,
        })
      : null;
  // Findings are part of a vehicle's record: a vehicle not on file has none to add them to, so
  // it gets no finding forms.
  const vehicleId = result?.found ? result.vehicle.id : null;
  const recording =
    vehicleId !== null && can(auth.role, "findings:record")
      ? {
          vehicleId,
          odometer: q?.odometer,
          dtcCodes: codes.codes.map((c) => c.code).join(" "),
          symptom: symptom.symptom ?? undefined,
          complaint: q?.words,
        }
      : null;
  const submitted = Object.keys(raw).length > 0;

  return (
    <>
      {/* The one-page sheet: smaller type and tight margins in print only. */}
      <style>{PRINT_CSS}</style>
      <PageHeader
        title="Lookup"
        description="Likely causes for this vehicle at this mileage, before you start."
        actions={result?.found ? <PrintButton /> : undefined}
      />
      <form
        method="get"
        action="/lookup"
        aria-label="Look up a vehicle"
        className="no-print mb-4 rounded-lg border border-line bg-panel p-4"
      >
        <div className="grid gap-4 md:grid-cols-3">
          {queryFields(VEHICLE_FIELDS(unit), raw, errors)}
          <label className="block text-sm">
            <span className="mb-1 block font-medium text-ink">Symptom (from the list)</span>
            <select
              name="symptom"
              defaultValue={raw.symptom ?? ""}
              aria-invalid={errors.symptom ? true : undefined}
              aria-describedby={errors.symptom ? "symptom-error" : undefined}
              className={inputClass}
            >
              <option value="">Read it from the words</option>
              {SYMPTOMS.map((s) => (
                <option key={s} value={s}>
                  {SYMPTOM_LABELS[s]}
                </option>
              ))}
            </select>
            {errors.symptom ? (
              <span id="symptom-error" className="mt-1 block text-alarm-700">
                {errors.symptom.join(" ")}
              </span>
            ) : null}
          </label>
        </div>
        <fieldset className="mt-4 border-t border-line pt-3">
          <legend className="pr-2 text-sm font-medium text-ink">
            Not on file? Look it up by its cohort
          </legend>
          <div className="grid gap-4 md:grid-cols-3">
            {queryFields(WALK_IN_FIELDS, raw, errors)}
          </div>
        </fieldset>
        <div className="mt-4 flex flex-wrap items-center gap-3">
          <button type="submit" className={buttonClass.primary}>
            Look up
          </button>
          {submitted ? (
            <Link href="/lookup" className="text-sm">
              Start again
            </Link>
          ) : null}
        </div>
      </form>

      <p className="mb-1 hidden text-xs print:block">
        Technician sheet · {auth.organisation.name} · printed{" "}
        {new Date().toISOString().slice(0, 10)} by {auth.user.name}
      </p>
      <SafetyNote />

      {submitted && !hasVehicle && parsed.success ? (
        <p role="alert" className="mt-4 rounded-md bg-alarm-100 px-4 py-3 text-alarm-700">
          {isWalkInPartial
            ? "For a vehicle not on file, enter its make, model and model year (or a VIN that codes the year)."
            : "Enter a VIN or a unit number to look a vehicle up, or the make, model and model year of one not on file."}
        </p>
      ) : null}

      {submitted && hasVehicle ? (
        <div className="mt-4 space-y-4 print:mt-2 print:space-y-2">
          <VehiclePanel
            result={result}
            vinCheck={vinCheck}
            unitQuery={q?.unit}
            orgName={auth.organisation.name}
            canAddVehicle={can(auth.role, "vehicles:write")}
            canRecordFindings={can(auth.role, "findings:record")}
            walkIn={walkIn}
            codes={codes.codes}
            symptom={symptom}
            unit={unit}
          />
          {result?.found ? (
            <Causes
              result={result}
              unit={unit}
              isFiltered={codes.codes.length > 0 || Boolean(symptom.symptom)}
              recording={recording}
            />
          ) : null}
        </div>
      ) : null}
    </>
  );
}

function QueryField({
  name,
  label,
  hint,
  errors,
  ...input
}: {
  name: string;
  label: string;
  hint?: string;
  errors?: string[];
} & React.InputHTMLAttributes<HTMLInputElement>) {
  const errorId = errors?.length ? `${name}-error` : undefined;
  const hintId = hint ? `${name}-hint` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(" ") || undefined;
  return (
    <div className="text-sm">
      <label htmlFor={`q-${name}`} className="mb-1 block font-medium text-ink">
        {label}
      </label>
      <input
        id={`q-${name}`}
        name={name}
        aria-invalid={errorId ? true : undefined}
        aria-describedby={describedBy}
        className={inputClass}
        {...input}
      />
      {hint ? (
        <span id={hintId} className="mt-1 block text-ink-soft">
          {hint}
        </span>
      ) : null}
      {errorId ? (
        <span id={errorId} className="mt-1 block text-alarm-700">
          {errors?.join(" ")}
        </span>
      ) : null}
    </div>
  );
}

function VinFacts({ check }: { check: VinCheck }) {
  return (
    <div className="text-sm" data-testid="vin-check">
      <p>
        <span className="font-mono">{check.vin || "(empty)"}</span>
        {check.isWellFormed ? (
          check.hasValidCheckDigit ? (
            <span className="ml-2 rounded bg-ok-100 px-1.5 py-0.5 text-ok-700">
              check digit correct (49 CFR 565)
            </span>
          ) : (
            <span className="ml-2 rounded bg-ochre-100 px-1.5 py-0.5 text-ochre-700">
              warning: check digit does not match (49 CFR 565)
            </span>
          )
        ) : null}
      </p>
      {check.isWellFormed ? (
        <p className="mt-1 text-ink-soft">
          Maker code (WMI) <span className="font-mono">{check.wmi}</span> · descriptor (VDS){" "}
          <span className="font-mono">{check.vds}</span> · serial part (VIS){" "}
          <span className="font-mono">{check.vis}</span> · model year{" "}
          {check.modelYear ?? check.modelYears?.join(" or ") ?? "not coded"}
        </p>
      ) : null}
      {check.problems.length > 0 ? (
        <ul className="mt-1 list-disc pl-5 text-ochre-700">
          {check.problems.map((p) => (
            <li key={p}>{p}</li>
          ))}
        </ul>
      ) : null}
      <p className="mt-1 text-xs text-ink-soft print:hidden">
        Check digit and model year per 49 CFR 565 (position 9: weighted sum mod 11; position 10 with
        the position-7 rule for light vehicles). Outside North America a wrong check digit is only a
        warning.
      </p>
    </div>
  );
}

function VehiclePanel({
  result,
  vinCheck,
  unitQuery,
  orgName,
  canAddVehicle,
  canRecordFindings,
  walkIn,
  codes,
  symptom,
  unit,
}: {
  result: LookupResult | null;
  vinCheck: VinCheck | null;
  unitQuery?: string;
  orgName: string;
  canAddVehicle: boolean;
  canRecordFindings: boolean;
  walkIn: ReturnType<typeof walkInOf>;
  codes: ReturnType<typeof readCodes>["codes"];
  symptom: ReturnType<typeof readSymptom>;
  unit: "mi" | "km";
}) {
  const v = result?.vehicle ?? null;
  return (
    <Panel title="Vehicle" className="print:p-3">
      <div className="grid gap-4 md:grid-cols-2 print:grid-cols-2 print:gap-2">
        <div className="space-y-2">
          {result?.found && v ? (
            <div data-testid="vehicle-found">
              <p className="text-lg font-semibold print:text-base">
                {v.make} {v.model} {v.generation ?? ""} · {v.modelYear}
                {v.unitNumber ? (
                  <span className="ml-2 font-normal">unit {v.unitNumber}</span>
                ) : null}
                {v.id === null ? (
                  <span className="ml-2 rounded bg-ochre-100 px-1.5 py-0.5 text-sm font-normal text-ochre-700">
                    not on file
                  </span>
                ) : null}
              </p>
              {v.id === null ? (
                <p className="text-sm" data-testid="walk-in">
                  Not in {orgName}&apos;s records
                  {vinCheck ? ` (no vehicle with VIN ${vinCheck.vin})` : ""}: looked up by make,
                  model and model year
                  {walkIn?.isYearFromVin ? " (the model year its VIN codes)" : ""}, against the
                  records of the organisation&apos;s vehicles of the same cohort. No history of its
                  own is counted
                  {canRecordFindings
                    ? ", and findings can be recorded only on a vehicle on file"
                    : ""}
                  {canRecordFindings ? (
                    canAddVehicle ? (
                      <>
                        {" "}
                        (<Link href="/vehicles">add the vehicle</Link>)
                      </>
                    ) : (
                      " (ask a manager to add the vehicle)"
                    )
                  ) : null}
                  .
                </p>
              ) : null}
              <p className="text-sm">
                Cohort <strong>{result.cohort}</strong>
                {result.odometerMi !== null ? (
                  <>
                    {" "}
                    · odometer <strong>{formatDistance(result.odometerMi, unit)}</strong>
                    {result.isOdometerFromRecords
                      ? ` (latest on record${v.lastOdometerOn ? `, ${v.lastOdometerOn}` : ""})`
                      : ""}
                  </>
                ) : null}
                {result.band ? (
                  <>
                    {" "}
                    · mileage band{" "}
                    <strong>{formatBand(result.band.fromMi, result.band.toMi, unit)}</strong>
                  </>
                ) : null}
              </p>
              {result.odometerMi === null ? (
                <p className="text-sm text-ochre-700">
                  No odometer entered and none on record: the mileage band is unknown, so the whole
                  cohort is counted and no pattern cells are shown.
                </p>
              ) : null}
              {vinCheck?.modelYear && vinCheck.modelYear !== v.modelYear ? (
                <p className="text-sm text-ochre-700">
                  The VIN codes model year {vinCheck.modelYear}; the record says {v.modelYear}.
                </p>
              ) : null}
              {v.id !== null ? (
                <p className="no-print mt-1 text-sm">
                  <Link href={`/vehicles/${v.id}`}>This vehicle&apos;s history →</Link>
                </p>
              ) : null}
            </div>
          ) : result && !result.found && result.reason === "unknown-model" ? (
            <p role="alert" className="rounded-md bg-alarm-100 px-3 py-2 text-alarm-700">
              No {walkIn?.make} {walkIn?.model} in {orgName}&apos;s vehicles or generation
              catalogue: there is no cohort to count. Check the spelling of the make and model.
            </p>
          ) : (
            <p role="alert" className="rounded-md bg-alarm-100 px-3 py-2 text-alarm-700">
              No vehicle with {vinCheck ? `VIN ${vinCheck.vin}` : `unit number ${unitQuery ?? ""}`}
              {vinCheck && unitQuery ? ` or unit number ${unitQuery}` : ""} in {orgName}. Check the
              characters, enter its make, model and model year under &ldquo;Not on file?&rdquo; to
              look it up by its cohort, or{" "}
              {canAddVehicle ? (
                <Link href="/vehicles">add the vehicle</Link>
              ) : (
                "ask a manager to add the vehicle"
              )}
              .
            </p>
          )}
          {vinCheck ? <VinFacts check={vinCheck} /> : null}
        </div>
        <div className="space-y-2 text-sm">
          <h3 className="font-semibold">Codes</h3>
          {codes.length === 0 ? (
            <p className="text-ink-soft">None entered.</p>
          ) : (
            <ul className="space-y-1" data-testid="codes">
              {codes.map((c) => (
                <li key={c.code}>
                  <span className="font-mono font-semibold">{c.code}</span>
                  {result?.descriptions[c.code] ? ` ${result.descriptions[c.code]}` : ""}
                  <span className="block text-ink-soft">
                    {c.areaName},{" "}
                    {c.control === "reserved"
                      ? "reserved / unknown control"
                      : c.control === "generic"
                        ? "generic (SAE/ISO)"
                        : "manufacturer-specific"}
                    {c.subsystem ? `, ${c.subsystem}` : ""}
                    {c.failureType ? `, failure type ${c.failureType}` : ""}
                  </span>
                </li>
              ))}
            </ul>
          )}
          <p className="text-xs text-ink-soft">Structure per SAE J2012 / ISO 15031-6.</p>
          <h3 className="font-semibold">Symptom</h3>
          <p>
            {symptom.symptom
              ? `${SYMPTOM_LABELS[symptom.symptom]}${symptom.source === "words" ? " (read from your words)" : ""}`
              : "None given (or not recognised in the words)."}
          </p>
          {result?.found && result.codeCells.length > 0 ? (
            <ul className="text-xs text-ink-soft">
              {result.codeCells.map((c) => (
                <li key={c.faultKey}>
                  {c.dtc} on this cohort in this band: {c.events} repair{c.events === 1 ? "" : "s"},{" "}
                  {formatSig(ratePerTenThousand(c.rate, unit))} per 10,000 {unit} (95%{" "}
                  {formatInterval(
                    ratePerTenThousand(c.rateLower, unit),
                    ratePerTenThousand(c.rateUpper, unit),
                  )}
                  )
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      </div>
    </Panel>
  );
}

function Causes({
  result,
  unit,
  isFiltered,
  recording,
}: {
  result: Extract<LookupResult, { found: true }>;
  unit: "mi" | "km";
  /** Whether the count is narrowed to the entered codes or symptom. */
  isFiltered: boolean;
  /** What a finding recorded here is about; null: no finding forms. */
  recording: FindingContext | null;
}) {
  const band = result.band ? formatBand(result.band.fromMi, result.band.toMi, unit) : null;
  return (
    <section aria-labelledby="causes-heading">
      <h2 id="causes-heading" className="text-lg font-semibold print:text-base">
        Likely causes for {result.cohort}
        {band ? ` at ${band}` : ""}
      </h2>
      <p className="mt-1 text-sm" data-testid="counted-on">
        Counted on {result.matchedLines} repair line{result.matchedLines === 1 ? "" : "s"} of{" "}
        {result.cohort}
        {result.isWidened ? " over the whole cohort (all mileages)" : band ? ` in ${band}` : ""}
        {isFiltered ? " that carry the entered codes or symptom" : ""}.
        {result.isWidened && result.band ? (
          <strong className="text-ochre-700">
            {" "}
            Fewer than 10 such lines in this band, so the count was widened to the whole cohort.
          </strong>
        ) : null}
      </p>
      <p className="mt-1 text-xs text-ink-soft print:hidden">{RANKING_RULE}</p>
      {result.causes.length === 0 ? (
        <p className="mt-3 rounded-md border border-line bg-panel px-4 py-3">
          No known issue or pattern fits this cohort and mileage with these codes. Work through the
          usual diagnosis, and record what you find below.
        </p>
      ) : (
        <ol className="mt-3 space-y-4 print:space-y-2" data-testid="causes">
          {result.causes.map((c, i) => (
            <CauseBlock
              key={c.key}
              cause={c}
              rank={i + 1}
              unit={unit}
              recording={recording}
              isPrinted={i < PRINTED_CAUSES}
            />
          ))}
        </ol>
      )}
      {recording ? (
        <Panel title="Something else was the cause" className="no-print mt-4">
          <SomethingElseForm context={recording} />
        </Panel>
      ) : null}
    </section>
  );
}

function CauseBlock({
  cause: c,
  rank,
  unit,
  recording,
  isPrinted,
}: {
  cause: CauseResult;
  rank: number;
  unit: "mi" | "km";
  recording: FindingContext | null;
  isPrinted: boolean;
}) {
  const s = c.share;
  const fs = c.fixSuccess;
  return (
    <li
      className={`break-inside-avoid rounded-lg border border-line bg-panel p-4 print:p-2 print:text-[10pt] ${isPrinted ? "" : "print:hidden"}`}
      data-testid="cause"
    >
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 className="text-base font-semibold">
          <span className="mr-2 text-ink-soft">{rank}.</span>
          {c.knownIssue ? (
            <Link href={`/known-issues/${c.knownIssue.id}`}>{c.title}</Link>
          ) : (
            <>Pattern: {c.title}</>
          )}
        </h3>
        <span className="rounded bg-sea-50 px-2 py-0.5 text-xs text-sea-800">
          {c.knownIssue
            ? `Known issue · ${STATE_LABELS[c.knownIssue.state].label}`
            : "Computed pattern cell"}
        </span>
      </div>
      <p className="mt-1" data-testid="cause-share">
        {s.trials > 0 ? (
          <>
            Was the cause in{" "}
            <strong>
              {s.successes} of {s.trials}
            </strong>{" "}
            ({pct(s.estimate)}, 95% {pct(s.lower)}–{pct(s.upper)})
            <span className="text-sm text-ink-soft">
              {" "}
              · repair lines {s.fromLines.fixed} of {s.fromLines.of}
              {s.fromFindings.confirmed + s.fromFindings.notTheCause > 0
                ? ` · findings ${s.fromFindings.confirmed} the cause, ${s.fromFindings.notTheCause} not`
                : ""}
            </span>
          </>
        ) : (
          <span className="text-ink-soft">
            No matching repairs or findings yet: no share to show.
          </span>
        )}
      </p>
      {c.cell ? (
        <p className="text-sm text-ink-soft">
          {c.kind === "cell" ? "This cell" : "Its cell"} in this band: {c.cell.events} repair
          {c.cell.events === 1 ? "" : "s"}, {formatSig(ratePerTenThousand(c.cell.rate, unit))} per
          10,000 {unit} (95%{" "}
          {formatInterval(
            ratePerTenThousand(c.cell.rateLower, unit),
            ratePerTenThousand(c.cell.rateUpper, unit),
          )}
          ){c.cell.isSignal ? " · signal" : ""}
          {c.cell.hasTooLittleData ? " · too little data to judge" : ""}
        </p>
      ) : null}
      <div className="mt-3 grid gap-4 md:grid-cols-2 print:mt-1 print:grid-cols-2 print:gap-2">
        <div>
          <h4 className="text-sm font-semibold">Quick checks, in order</h4>
          {c.checks.length > 0 ? (
            <ol className="mt-1 list-decimal space-y-0.5 pl-5 text-sm" data-testid="checks">
              {c.checks.map((t) => (
                <li key={t}>{t}</li>
              ))}
            </ol>
          ) : (
            <p className="mt-1 text-sm text-ink-soft">
              None written: this is a computed pattern, not a known issue.
            </p>
          )}
        </div>
        <div className="text-sm">
          <h4 className="font-semibold">The fix</h4>
          <p className="mt-1">
            {c.fix.laborOperation ? <strong>{c.fix.laborOperation}. </strong> : null}
            {c.fix.description ??
              (c.fix.source === "records" ? "No correction text on record." : "")}
          </p>
          <p className="text-ink-soft">
            {c.fix.typicalHours !== null
              ? `${formatSig(c.fix.typicalHours, 2)} h ${c.fix.source === "records" ? "(median on record)" : "typical"}`
              : "Hours not known"}
            {c.fix.parts.length > 0
              ? ` · parts ${c.fix.parts.map((p) => `${p.partNumber}${p.quantity > 1 ? ` ×${p.quantity}` : ""}${p.description ? ` (${p.description})` : ""}`).join(", ")}`
              : ""}
          </p>
          <p className="mt-1" data-testid="fix-success">
            {fs ? (
              <>
                Fix held in{" "}
                <strong>
                  {fs.held} of {fs.fixes}
                </strong>{" "}
                ({pct(fs.estimate)}, 95% {pct(fs.lower)}–{pct(fs.upper)}); {fs.comebacks} came back
                within the comeback window.
              </>
            ) : (
              <span className="text-ink-soft">
                No repairs of this fix on record for this cohort.
              </span>
            )}
          </p>
        </div>
      </div>
      <div className="mt-3 print:mt-1">
        <h4 className="text-sm font-semibold">Cautions</h4>
        <CautionList cautions={c.cautions} className="mt-1" />
      </div>
      {recording && c.knownIssue ? (
        <KnownIssueFindingForm context={recording} knownIssueId={c.knownIssue.id} title={c.title} />
      ) : recording && c.component ? (
        <ComponentFindingForm
          context={recording}
          componentSlug={c.component.slug}
          title={c.title}
          correction={c.fix.description}
        />
      ) : null}
    </li>
  );
}
