import Link from "next/link";
import { Panel } from "@/components/ui/panel";
import type { LookupResult } from "@/db/queries/lookup";
import { formatBand } from "@/lib/format";
import { SYMPTOM_LABELS } from "@/lib/known-issues";
import type { readCodes, readSymptom, walkInOf } from "@/lib/lookup";
import { describeTooLittle, RATE } from "@/lib/metrics";
import { faultName, intervalLabel } from "@/lib/plain-words";
import { formatDistance } from "@/lib/units";
import type { VinCheck } from "@/lib/vin";
import { VinFacts } from "./vin-facts";

/** The vehicle looked up (or why none was found), its codes decoded, and its symptom. */
export function VehiclePanel({
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
                  <span className="font-semibold">
                    {faultName({ dtc: c.code, dtcDescription: result?.descriptions[c.code] })}
                  </span>
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
            <ul className="text-xs text-ink-soft print:hidden" data-testid="code-cells">
              {result.codeCells.map((c) => (
                <li key={c.faultKey}>
                  {c.faultName}, on this cohort in this band:{" "}
                  {c.hasTooLittleData
                    ? describeTooLittle(c, unit)
                    : `${RATE.describe(c, { unit, confidence: result.cellConfidence })} (${intervalLabel(result.cellConfidence)})`}
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      </div>
    </Panel>
  );
}
