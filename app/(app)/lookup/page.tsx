import type { Metadata } from "next";
import { Causes } from "@/components/lookup/causes";
import { LookupForm } from "@/components/lookup/lookup-form";
import { PrintButton } from "@/components/lookup/print-button";
import { VehiclePanel } from "@/components/lookup/vehicle-panel";
import { PageHeader } from "@/components/ui/page-header";
import { SafetyNote } from "@/components/ui/safety-note";
import { getDb } from "@/db";
import { getLookup } from "@/db/queries/lookup";
import { requirePage } from "@/lib/auth/guard";
import { can } from "@/lib/auth/roles";
import { LookupQuery, readCodes, readSymptom, walkInOf } from "@/lib/lookup";
import { checkVin } from "@/lib/vin";
import { queryValues, type PageSearchParams } from "@/lib/search-params";

export const metadata: Metadata = { title: "Lookup" };

const PRINT_CSS = `@media print {
  @page { size: auto; margin: 10mm; }
  html { font-size: 10.5px; }
  main { max-width: none !important; padding: 0 !important; }
}`;

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
      <LookupForm raw={raw} errors={errors} unit={unit} submitted={submitted} />

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
