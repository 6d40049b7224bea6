"use client";

import { useState } from "react";
import { updateSettingsAction } from "@/app/(app)/settings/actions";
import { buttonClass, inputClass } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { useFormAction } from "@/components/ui/use-form-action";
import { parseFormNumber } from "@/lib/form-number";
import { convertDistanceSetting } from "@/lib/units";

/** The settings given in the organisation's distance unit. */
const DISTANCE_FIELDS = ["bandWidth", "comebackDistance", "refuelWindow", "minExposure"] as const;

export type SettingsValues = {
  name: string;
  distanceUnit: "mi" | "km";
  bandWidth: number;
  comebackDays: number;
  comebackDistance: number;
  refuelWindow: number;
  confidenceLevel: number;
  minExposure: number;
  uploadLimitMb: number;
};

export function SettingsForm({ values }: { values: SettingsValues }) {
  const {
    state,
    isPending,
    formRef,
    onSubmit,
    fieldErrors: errors,
  } = useFormAction(updateSettingsAction);
  const [unit, setUnit] = useState(values.distanceUnit);
  // A new unit converts the distances shown, so that the bands stay the same length unless
  // they are changed on purpose (25,000 mi becomes 40,000 km, not 25,000 km).
  const onUnitChange = (next: "mi" | "km") => {
    for (const name of DISTANCE_FIELDS) {
      const input = formRef.current?.elements.namedItem(name);
      if (!(input instanceof HTMLInputElement)) continue;
      // Read as the server reads it (lib/form-number.ts): "25,000" is 25000.
      const value = parseFormNumber(input.value);
      if (value === null) continue;
      // Back to the saved unit with the figure untouched: the saved figure, exactly.
      const saved = values[name];
      const isUntouched = value === convertDistanceSetting(saved, values.distanceUnit, unit);
      input.value = String(
        next === values.distanceUnit && isUntouched
          ? saved
          : convertDistanceSetting(value, unit, next),
      );
    }
    setUnit(next);
  };
  return (
    <form ref={formRef} onSubmit={onSubmit} className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
      <Field
        name="name"
        label="Organisation name"
        defaultValue={values.name}
        errors={errors?.name}
      />
      <label className="block text-sm">
        <span className="mb-1 block font-medium">Distances in</span>
        <select
          name="distanceUnit"
          value={unit}
          onChange={(e) => onUnitChange(e.target.value === "km" ? "km" : "mi")}
          className={inputClass}
        >
          <option value="mi">miles</option>
          <option value="km">kilometres</option>
        </select>
      </label>
      <Field
        name="bandWidth"
        label={`Mileage band width (${unit})`}
        inputMode="numeric"
        defaultValue={values.bandWidth}
        errors={errors?.bandWidth}
        hint="Default 25,000 mi (40,000 km)."
      />
      <Field
        name="comebackDays"
        label="Comeback window (days)"
        inputMode="numeric"
        defaultValue={values.comebackDays}
        errors={errors?.comebackDays}
      />
      <Field
        name="comebackDistance"
        label={`Comeback window (${unit})`}
        inputMode="numeric"
        defaultValue={values.comebackDistance}
        errors={errors?.comebackDistance}
      />
      <Field
        name="refuelWindow"
        label={`Post-refuel window (${unit})`}
        inputMode="numeric"
        defaultValue={values.refuelWindow}
        errors={errors?.refuelWindow}
      />
      <label className="block text-sm">
        <span className="mb-1 block font-medium">Interval confidence</span>
        <select
          name="confidenceLevel"
          defaultValue={String(values.confidenceLevel)}
          className={inputClass}
        >
          <option value="0.8">80%</option>
          <option value="0.9">90%</option>
          <option value="0.95">95%</option>
          <option value="0.99">99%</option>
        </select>
        <span className="mt-1 block text-ink-soft">
          What &ldquo;likely between&rdquo; and &ldquo;at least&rdquo; mean on every screen: how
          often the range holds the true figure.
        </span>
      </label>
      <Field
        name="minExposure"
        label={`Minimum exposure per cell (${unit})`}
        inputMode="numeric"
        defaultValue={values.minExposure}
        errors={errors?.minExposure}
        hint="Below this a cell shows as “too little data”."
      />
      <Field
        name="uploadLimitMb"
        label="Upload size limit (MB)"
        inputMode="numeric"
        defaultValue={values.uploadLimitMb}
        errors={errors?.uploadLimitMb}
      />
      <div className="flex items-center gap-3 sm:col-span-2 lg:col-span-3">
        <button type="submit" className={buttonClass.primary} disabled={isPending}>
          {isPending ? "Saving…" : "Save settings"}
        </button>
        {state ? (
          <p
            role={state.ok ? "status" : "alert"}
            className={state.ok ? "text-ok-700" : "text-alarm-700"}
          >
            {state.message}
          </p>
        ) : null}
      </div>
    </form>
  );
}
