/**
 * Input checks shared by lib/stats. Each throws an Error whose message starts with the name of
 * the public function that was called, so a caller sees which statistic rejected its input.
 * Internal: not re-exported from lib/stats/index.ts.
 */

export function fail(fn: string, message: string): never {
  throw new Error(`${fn}: ${message}`);
}

/** A confidence level strictly between 0 and 1 (e.g. 0.95). */
export function assertConfidence(fn: string, confidence: number, name = "confidence"): void {
  if (typeof confidence !== "number" || !(confidence > 0 && confidence < 1)) {
    fail(fn, `${name} must be a number strictly between 0 and 1`);
  }
}

export function assertNonNegativeInteger(fn: string, name: string, value: number): void {
  if (typeof value !== "number" || !Number.isSafeInteger(value) || value < 0) {
    fail(fn, `${name} must be a non-negative integer`);
  }
}

export function assertPositiveInteger(fn: string, name: string, value: number): void {
  if (typeof value !== "number" || !Number.isSafeInteger(value) || value < 1) {
    fail(fn, `${name} must be a positive integer`);
  }
}

/** A finite number > 0 (exposure, width, …): zero exposure carries no information. */
export function assertPositiveFinite(fn: string, name: string, value: number): void {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    fail(fn, `${name} must be a finite number greater than 0`);
  }
}

export function assertNonNegativeFinite(fn: string, name: string, value: number): void {
  if (typeof value !== "number" || !Number.isFinite(value) || value < 0) {
    fail(fn, `${name} must be a finite number greater than or equal to 0`);
  }
}

/** successes and trials of a binomial proportion, and the confidence level. */
export function assertProportionInputs(
  fn: string,
  successes: number,
  trials: number,
  confidence: number,
): void {
  assertPositiveInteger(fn, "trials", trials);
  assertNonNegativeInteger(fn, "successes", successes);
  if (successes > trials) fail(fn, "successes must not exceed trials");
  assertConfidence(fn, confidence);
}
