import seedrandom from "seedrandom";

/**
 * A seeded random source for the demo generator. Never Math.random: the same seed must give
 * byte-identical demo data on every machine and every run.
 */
export type Random = {
  /** Uniform in [0, 1). */
  next(): number;
  /** Uniform in [min, max). */
  between(min: number, max: number): number;
  /** Uniform integer in [min, max], both included. */
  int(min: number, max: number): number;
  chance(p: number): boolean;
  pick<T>(items: readonly T[]): T;
  /** Draws one item with probability proportional to its weight. */
  weighted<T>(items: readonly (readonly [T, number])[]): T;
  normal(mean: number, sd: number): number;
  exponential(mean: number): number;
  poisson(mean: number): number;
  /**
   * An independent stream named by a label. Each vehicle draws from its own fork, so that
   * adding a draw for one vehicle does not shift every vehicle generated after it.
   */
  fork(label: string): Random;
};

export function createRandom(seed: string | number): Random {
  // Alea: small, fast and, unlike the default ARC4 generator, cheap to create per vehicle.
  const prng = seedrandom.alea(String(seed));
  const next = () => prng();
  const random: Random = {
    next,
    between: (min, max) => min + (max - min) * next(),
    int: (min, max) => min + Math.floor(next() * (max - min + 1)),
    chance: (p) => next() < p,
    pick<T>(items: readonly T[]): T {
      if (items.length === 0) throw new Error("pick: no items to pick from");
      return items[Math.floor(next() * items.length)] as T;
    },
    weighted<T>(items: readonly (readonly [T, number])[]): T {
      const total = items.reduce((sum, [, w]) => sum + w, 0);
      let r = next() * total;
      for (const [item, w] of items) {
        r -= w;
        if (r < 0) return item;
      }
      const last = items.at(-1);
      if (!last) throw new Error("weighted: no items to pick from");
      return last[0];
    },
    normal(mean, sd) {
      // Box–Muller; 1 - next() keeps the logarithm away from zero.
      const u = 1 - next();
      const v = next();
      return mean + sd * Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
    },
    exponential: (mean) => -mean * Math.log(1 - next()),
    poisson(mean) {
      if (mean <= 0) return 0;
      if (mean > 30) return Math.max(0, Math.round(random.normal(mean, Math.sqrt(mean))));
      // Knuth's multiplication method: exact and quick for the small means used here.
      const limit = Math.exp(-mean);
      let k = 0;
      let p = next();
      while (p > limit) {
        k += 1;
        p *= next();
      }
      return k;
    },
    fork: (label) => createRandom(`${seed}/${label}`),
  };
  return random;
}
