/**
 * A cohort: make + model + generation (from the organisation's catalogue), or make + model +
 * model year when no generation covers the vehicle.
 */
export type Cohort = {
  key: string;
  make: string;
  model: string;
  /** Generation label, or the model year written as text. */
  label: string;
  generationId: number | null;
  yearFrom: number;
  yearTo: number;
};

/** SQL expression of a vehicle's cohort label (v = vehicles, g = its generation, left joined). */
export const COHORT_LABEL_SQL = "coalesce(g.label, cast(v.model_year as text))";

export function cohortKey(make: string, model: string, label: string): string {
  return `${make}|${model}|${label}`;
}
