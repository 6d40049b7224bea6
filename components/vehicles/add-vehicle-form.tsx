"use client";

import { createVehicleAction } from "@/app/(app)/vehicles/actions";
import { buttonClass, inputClass } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Panel } from "@/components/ui/panel";
import { useFormAction } from "@/components/ui/use-form-action";

export function AddVehicleForm() {
  const {
    state,
    isPending,
    formRef,
    onSubmit,
    fieldErrors: errors,
  } = useFormAction(createVehicleAction, { resetOnSuccess: true });
  return (
    <Panel title="Add a vehicle" className="mt-8">
      <form ref={formRef} onSubmit={onSubmit} className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        <Field
          name="vin"
          label="VIN"
          maxLength={17}
          errors={errors?.vin}
          className={`${inputClass} font-mono`}
        />
        <Field name="unitNumber" label="Unit number" errors={errors?.unitNumber} />
        <Field name="make" label="Make" required errors={errors?.make} />
        <Field name="model" label="Model" required errors={errors?.model} />
        <Field
          name="modelYear"
          label="Model year"
          inputMode="numeric"
          required
          errors={errors?.modelYear}
        />
        <Field name="engine" label="Engine" errors={errors?.engine} />
        <Field name="transmission" label="Transmission" errors={errors?.transmission} />
        <label className="block text-sm">
          <span className="mb-1 block font-medium">Odometer reads in</span>
          <select name="odometerUnit" className={inputClass} defaultValue="mi">
            <option value="mi">miles</option>
            <option value="km">kilometres</option>
          </select>
        </label>
        <div className="flex items-center gap-3 sm:col-span-2 lg:col-span-4">
          <button type="submit" className={buttonClass.primary} disabled={isPending}>
            {isPending ? "Adding…" : "Add vehicle"}
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
    </Panel>
  );
}
