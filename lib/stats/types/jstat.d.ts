/**
 * Minimal types for jstat 1.9.6 (it ships none), covering only what the lib/stats tests use
 * as an independent reference. jstat is a devDependency: never imported by lib/stats itself.
 */
declare module "jstat" {
  interface ContinuousInverse {
    inv(p: number, ...parameters: number[]): number;
    cdf(x: number, ...parameters: number[]): number;
    pdf(x: number, ...parameters: number[]): number;
  }
  interface Discrete {
    pdf(k: number, ...parameters: number[]): number;
    cdf(k: number, ...parameters: number[]): number;
  }
  interface JStatStatic {
    normal: ContinuousInverse;
    beta: ContinuousInverse;
    chisquare: ContinuousInverse;
    gamma: ContinuousInverse;
    binomial: Discrete;
    poisson: Discrete;
    gammaln(x: number): number;
    /** Regularized lower incomplete gamma P(a, x). */
    lowRegGamma(a: number, x: number): number;
  }
  export const jStat: JStatStatic;
  const jstat: { jStat: JStatStatic } & JStatStatic;
  export default jstat;
}
