/**
 * An independent reference library (jstat 1.9.6) recomputes the intervals on seeded random
 * inputs from the textbook formulas; lib/stats must agree to 1e-6 relative. jstat shares no code
 * with @stdlib or with lib/stats/internal/gamma.ts.
 */
import { describe, it } from "vitest";
import { clopperPearsonInterval, poissonInterval, rateRatio, wilsonInterval } from "@/lib/stats";
import { expectRelativelyClose, jStat, seededInteger, seededUniform } from "./support";

const RELATIVE = 1e-6;
const CASES = 300;
const LEVELS = [0.8, 0.9, 0.95, 0.99];

/** Clopper–Pearson bounds from jstat's beta inverse: B⁻¹(α/2; x, n−x+1), B⁻¹(1−α/2; x+1, n−x). */
function referenceClopperPearson(x: number, n: number, confidence: number) {
  const alpha = 1 - confidence;
  return {
    lower: x === 0 ? 0 : jStat.beta.inv(alpha / 2, x, n - x + 1),
    upper: x === n ? 1 : jStat.beta.inv(1 - alpha / 2, x + 1, n - x),
  };
}

describe(`jstat reference on ${CASES} seeded inputs each (relative tolerance ${RELATIVE})`, () => {
  it("wilsonInterval: n up to 2,000, four confidence levels", () => {
    const integer = seededInteger("reference-wilson");
    for (let i = 0; i < CASES; i++) {
      const n = integer(1, 2000);
      const x = integer(0, n);
      const confidence = LEVELS[i % LEVELS.length]!;
      const z = jStat.normal.inv(1 - (1 - confidence) / 2, 0, 1);
      const p = x / n;
      const centre = 2 * n * p + z * z;
      const spread = z * Math.sqrt(z * z + 4 * n * p * (1 - p));
      const lower = x === 0 ? 0 : (centre - spread) / (2 * (n + z * z));
      const upper = x === n ? 1 : (centre + spread) / (2 * (n + z * z));
      const got = wilsonInterval(x, n, confidence);
      expectRelativelyClose(got.lower, lower, RELATIVE, `Wilson lower ${x}/${n} @${confidence}`);
      expectRelativelyClose(got.upper, upper, RELATIVE, `Wilson upper ${x}/${n} @${confidence}`);
    }
  });

  it("clopperPearsonInterval: n up to 1,000, four confidence levels", () => {
    const integer = seededInteger("reference-cp");
    for (let i = 0; i < CASES; i++) {
      const n = integer(1, 1000);
      const x = integer(0, n);
      const confidence = LEVELS[i % LEVELS.length]!;
      const reference = referenceClopperPearson(x, n, confidence);
      const got = clopperPearsonInterval(x, n, confidence);
      expectRelativelyClose(got.lower, reference.lower, RELATIVE, `CP lower ${x}/${n}`);
      expectRelativelyClose(got.upper, reference.upper, RELATIVE, `CP upper ${x}/${n}`);
    }
  });

  it("poissonInterval (Garwood): counts up to 5,000 (past @stdlib's weak region), any exposure", () => {
    const integer = seededInteger("reference-garwood");
    const uniform = seededUniform("reference-garwood-exposure");
    for (let i = 0; i < CASES; i++) {
      const x = i < CASES / 2 ? integer(0, 200) : integer(200, 5000);
      const exposure = 10 ** (uniform() * 8 - 2);
      const confidence = LEVELS[i % LEVELS.length]!;
      const alpha = 1 - confidence;
      const lower = x === 0 ? 0 : jStat.chisquare.inv(alpha / 2, 2 * x) / 2 / exposure;
      const upper = jStat.chisquare.inv(1 - alpha / 2, 2 * x + 2) / 2 / exposure;
      const got = poissonInterval(x, exposure, confidence);
      expectRelativelyClose(got.lower, lower, RELATIVE, `Garwood lower x=${x}`);
      expectRelativelyClose(got.upper, upper, RELATIVE, `Garwood upper x=${x}`);
    }
  });

  it("rateRatio limits: counts up to 500 each, exposures over four orders of magnitude", () => {
    const integer = seededInteger("reference-ratio");
    const uniform = seededUniform("reference-ratio-exposure");
    for (let i = 0; i < CASES; i++) {
      const a = integer(0, 500);
      const b = integer(a === 0 ? 1 : 0, 500);
      const exposureA = 10 ** (uniform() * 4 + 1);
      const exposureB = 10 ** (uniform() * 4 + 1);
      const confidence = LEVELS[i % LEVELS.length]!;
      const share = referenceClopperPearson(a, a + b, confidence);
      const toRatio = (p: number) => (p === 1 ? Infinity : (p / (1 - p)) * (exposureB / exposureA));
      const got = rateRatio(a, exposureA, b, exposureB, confidence);
      expectRelativelyClose(got.lower, toRatio(share.lower), RELATIVE, `ratio lower (${a}, ${b})`);
      expectRelativelyClose(got.upper, toRatio(share.upper), RELATIVE, `ratio upper (${a}, ${b})`);
    }
  });
});
