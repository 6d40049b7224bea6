import { assertConfidence, fail } from "./internal/validate";

/** Benjamini–Hochberg adjusted p-values and rejection decisions, in the input order. */
export interface BenjaminiHochbergResult {
  /** BH-adjusted p-values ("q-values"), same order as the input. */
  adjusted: number[];
  /** True where the step-up procedure rejects at false discovery rate q. */
  rejected: boolean[];
}

/**
 * Benjamini–Hochberg step-up procedure controlling the false discovery rate across many
 * cells (cohort × mileage band × fault) tested at once.
 *
 * Definition: sort the m p-values p(1) ≤ … ≤ p(m); let k be the largest i with
 * p(i) ≤ (i/m)·q; reject the hypotheses of p(1)…p(k). The adjusted p-value of p(i) is
 * min over j ≥ i of min(1, m·p(j)/j) (as R's p.adjust(method = "BH")); a hypothesis is
 * rejected exactly when its adjusted p-value is ≤ q, up to rounding at exact ties, where the
 * step-up rule above is the one applied.
 *
 * Method: one sort (ties keep input order) and one backward pass, O(m log m).
 *
 * Source: Benjamini, Y. & Hochberg, Y. (1995), "Controlling the false discovery rate: a
 * practical and powerful approach to multiple testing", JRSS B 57:289–300.
 *
 * @param pValues numbers in [0, 1]; an empty array gives empty results
 * @param q false discovery rate, 0 < q < 1 (default 0.05)
 * @throws Error "benjaminiHochberg: …" when a p-value is not a number in [0, 1] (NaN included)
 *   or q is outside (0, 1)
 * @example
 * benjaminiHochberg([0.01, 0.04, 0.03]); // adjusted [0.03, 0.04, 0.04], rejected all true
 */
export function benjaminiHochberg(pValues: readonly number[], q = 0.05): BenjaminiHochbergResult {
  const fn = "benjaminiHochberg";
  if (!Array.isArray(pValues)) fail(fn, "pValues must be an array");
  assertConfidence(fn, q, "q");
  pValues.forEach((p, i) => {
    if (typeof p !== "number" || !(p >= 0 && p <= 1)) {
      fail(fn, `pValues[${i}] must be a number between 0 and 1`);
    }
  });

  const m = pValues.length;
  const order = pValues.map((_, i) => i).sort((a, b) => pValues[a]! - pValues[b]! || a - b);
  const adjusted = new Array<number>(m);
  const rejected = new Array<boolean>(m).fill(false);

  let runningMin = 1;
  let cutoffRank = 0;
  for (let rank = m; rank >= 1; rank--) {
    const index = order[rank - 1]!;
    const p = pValues[index]!;
    runningMin = Math.min(runningMin, (m * p) / rank);
    adjusted[index] = runningMin;
    if (cutoffRank === 0 && p <= (rank / m) * q) cutoffRank = rank;
  }
  for (let rank = 1; rank <= cutoffRank; rank++) rejected[order[rank - 1]!] = true;
  return { adjusted, rejected };
}
