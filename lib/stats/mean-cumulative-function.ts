import { twoSidedZ } from "./internal/distributions";
import { assertConfidence, assertNonNegativeFinite, fail } from "./internal/validate";

/** A cost (or any non-negative amount) recorded at an age. */
export interface ValuedEvent {
  at: number;
  value: number;
}

/**
 * One unit's history: the age at which observation ended, and its events — either ages (each
 * event counts 1) or { at, value } pairs (the value is summed: cost MCF).
 */
export interface RecurrenceHistory {
  end: number;
  events: readonly number[] | readonly ValuedEvent[];
}

/** The MCF just after one distinct event age. */
export interface McfPoint {
  /** Event age t_k. */
  at: number;
  /** M(t_k) = Σ_{t_j ≤ t_k} d_j / n_j */
  mcf: number;
  /** Robust (Lawless–Nadeau) variance of M(t_k). */
  variance: number;
  lower: number;
  upper: number;
  /** Units under observation at t_k (histories ending at t_k included). */
  atRisk: number;
}

/**
 * Nelson's mean cumulative function: the average number (or cost) of repairs per unit up to
 * each age, from histories that end at different ages.
 *
 * Definition: with distinct event ages t_1 < … < t_K, n_k units under observation at t_k (a
 * unit whose history ends exactly at t_k still counts) and d_ik the number (or total value) of
 * unit i's events at t_k, M(t) = Σ_{t_k ≤ t} d_k / n_k with d_k = Σ_i d_ik.
 * Robust variance (Lawless & Nadeau 1995), summing over units i and, within a unit, over the
 * ages at which it is observed:
 *   Var M(t) = Σ_i [ Σ_{t_k ≤ t, t_k ≤ end_i} (d_ik − d_k/n_k) / n_k ]².
 * It does not assume Poisson events. Limits: where M > 0, M·exp(∓z·SE/M) (log scale, Meeker &
 * Escobar §16.4); where M = 0 (only zero-valued events so far), M ± z·SE clipped at 0.
 *
 * Method: one pass over the ages, keeping the per-unit sums of the bracket above for units still
 * observed as running totals (Σ D_i and Σ D_i²) and freezing a unit's square when its history
 * ends, so the cost is O((units + events) log) rather than units × ages.
 *
 * Sources: Nelson, W. (1988), "Graphical analysis of system repair data", J. Quality
 * Technology 20:24–35; Nelson, W. (1995), "Confidence limits for recurrence data — applied to
 * cost or number of product repairs", Technometrics 37:147–157; Lawless, J. F. & Nadeau, C.
 * (1995), "Some simple robust methods for the analysis of recurrent events", Technometrics
 * 37:158–168; Meeker, W. Q. & Escobar, L. A. (1998), Statistical Methods for Reliability Data,
 * ch. 16.
 *
 * One row is returned per distinct event age, in increasing age; no events gives [].
 *
 * @param units histories: end a finite number ≥ 0; each event age (or `at`) finite with
 *   0 ≤ age ≤ end; each `value` finite ≥ 0
 * @param confidence two-sided confidence level, 0 < confidence < 1 (default 0.95)
 * @throws Error "meanCumulativeFunction: …" when units is not an array, an end or an event is
 *   not a finite number ≥ 0, an event lies after its unit's end, a value is negative, or
 *   confidence is outside (0, 1)
 * @example
 * meanCumulativeFunction([
 *   { end: 12, events: [5, 8] },
 *   { end: 16, events: [] },
 *   { end: 20, events: [1, 8, 16] },
 * ]); // mcf 0.3333, 0.6667, 1.3333, 1.8333 at 1, 5, 8, 16
 */
export function meanCumulativeFunction(
  units: readonly RecurrenceHistory[],
  confidence = 0.95,
): McfPoint[] {
  const fn = "meanCumulativeFunction";
  if (!Array.isArray(units)) fail(fn, "units must be an array");
  assertConfidence(fn, confidence);

  // Per unit: end, and its events merged by age.
  const histories = units.map((unit, i) => readHistory(fn, unit, i));
  // Events of all units, by age, as [unit index, value at that age].
  const eventsByAge = new Map<number, [number, number][]>();
  histories.forEach((history, unit) => {
    for (const [age, value] of history.events) {
      const list = eventsByAge.get(age);
      if (list) list.push([unit, value]);
      else eventsByAge.set(age, [[unit, value]]);
    }
  });
  const ages = [...eventsByAge.keys()].sort((a, b) => a - b);
  const byEnd = histories.map((h, unit) => ({ end: h.end, unit })).sort((a, b) => a.end - b.end);

  const z = twoSidedZ(confidence);
  const own = new Float64Array(histories.length); // D_i: Σ own d_ik / n_k so far
  let sumOwn = 0; // Σ D_i over units still observed
  let sumOwnSquared = 0; // Σ D_i² over units still observed
  let frozen = 0; // Σ of (D_i − A)² of units whose history has ended
  let common = 0; // A = Σ d̄_k / n_k so far
  let mcf = 0;
  let ended = 0; // units in byEnd[0..ended) no longer observed
  const points: McfPoint[] = [];

  for (const age of ages) {
    while (ended < byEnd.length && byEnd[ended]!.end < age) {
      const d = own[byEnd[ended]!.unit]!;
      frozen += (d - common) ** 2;
      sumOwn -= d;
      sumOwnSquared -= d * d;
      ended++;
    }
    const atRisk = byEnd.length - ended;
    let total = 0;
    for (const [unit, value] of eventsByAge.get(age)!) {
      const before = own[unit]!;
      const after = before + value / atRisk;
      own[unit] = after;
      sumOwn += after - before;
      sumOwnSquared += after * after - before * before;
      total += value;
    }
    const mean = total / atRisk;
    mcf += mean;
    common += mean / atRisk;
    const observed = sumOwnSquared - 2 * common * sumOwn + atRisk * common * common;
    const variance = Math.max(0, frozen + observed);
    const se = Math.sqrt(variance);
    const lower = mcf > 0 ? mcf * Math.exp((-z * se) / mcf) : Math.max(0, mcf - z * se);
    const upper = mcf > 0 ? mcf * Math.exp((z * se) / mcf) : mcf + z * se;
    points.push({ at: age, mcf, variance, lower, upper, atRisk });
  }
  return points;
}

interface History {
  end: number;
  /** age → total value of the unit's events at that age */
  events: Map<number, number>;
}

function readHistory(fn: string, unit: RecurrenceHistory, i: number): History {
  if (!unit || !Array.isArray(unit.events)) fail(fn, `units[${i}].events must be an array`);
  assertNonNegativeFinite(fn, `units[${i}].end`, unit.end);
  const events = new Map<number, number>();
  (unit.events as readonly (number | ValuedEvent)[]).forEach((event, j) => {
    const isBare = typeof event === "number";
    const age = isBare ? event : event?.at;
    const value = isBare ? 1 : event?.value;
    assertNonNegativeFinite(fn, `units[${i}].events[${j}] age`, age as number);
    assertNonNegativeFinite(fn, `units[${i}].events[${j}].value`, value as number);
    if ((age as number) > unit.end) {
      fail(fn, `units[${i}].events[${j}] is after the end of that unit's history`);
    }
    events.set(age as number, (events.get(age as number) ?? 0) + (value as number));
  });
  return { end: unit.end, events };
}
