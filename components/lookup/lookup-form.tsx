import Link from "next/link";
import { buttonClass, inputClass } from "@/components/ui/button";
import { SYMPTOM_LABELS, SYMPTOMS } from "@/lib/known-issues";

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

/** The lookup's question: vehicle, odometer, codes, words and symptom, or a walk-in's cohort. */
export function LookupForm({
  raw,
  errors,
  unit,
  submitted,
}: {
  raw: Record<string, string | undefined>;
  errors: Record<string, string[]>;
  unit: "mi" | "km";
  submitted: boolean;
}) {
  return (
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
        <div className="grid gap-4 md:grid-cols-3">{queryFields(WALK_IN_FIELDS, raw, errors)}</div>
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
