/**
 * A set of 52-bit row fingerprints in one Float64Array (open addressing, linear probing): the
 * in-file duplicate check of a million-row import costs about 16 MB instead of a JavaScript
 * Set's ~50 MB of boxed numbers. Fingerprints come from fingerprint52; 0 is reserved as "empty".
 */
export class FingerprintSet {
  private table = new Float64Array(1 << 16);
  private count = 0;

  /** Adds a fingerprint; returns false when it was already there. */
  add(fp: number): boolean {
    const key = fp === 0 ? 1 : fp;
    if ((this.count + 1) * 2 > this.table.length) this.grow();
    const mask = this.table.length - 1;
    let i = (key % 0x40000000) & mask;
    for (;;) {
      const slot = this.table[i] as number;
      if (slot === 0) {
        this.table[i] = key;
        this.count++;
        return true;
      }
      if (slot === key) return false;
      i = (i + 1) & mask;
    }
  }

  get size(): number {
    return this.count;
  }

  private grow(): void {
    const old = this.table;
    this.table = new Float64Array(old.length * 2);
    this.count = 0;
    for (const v of old) if (v !== 0) this.add(v);
  }
}

/** 52-bit hash of a string (two 32-bit FNV-1a-style lanes): collisions are ~1 in 10^9 at 10^6 rows. */
export function fingerprint52(s: string): number {
  let h1 = 0x811c9dc5;
  let h2 = 0x01000193;
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    h1 = Math.imul(h1 ^ c, 0x01000193) >>> 0;
    h2 = Math.imul(h2 ^ c, 0x5bd1e995) >>> 0;
  }
  return h1 * 0x100000 + (h2 & 0xfffff);
}

/**
 * fingerprint52 of a row's values joined with a separator, computed without building the
 * joined string (called for every row of a large file). Values: text, numbers, booleans, null.
 */
export function fingerprintValues(
  values: readonly (string | number | boolean | null | undefined)[],
): number {
  let h1 = 0x811c9dc5;
  let h2 = 0x01000193;
  for (const value of values) {
    if (value !== null && value !== undefined) {
      const s = typeof value === "string" ? value : String(value);
      for (let i = 0; i < s.length; i++) {
        const c = s.charCodeAt(i);
        h1 = Math.imul(h1 ^ c, 0x01000193) >>> 0;
        h2 = Math.imul(h2 ^ c, 0x5bd1e995) >>> 0;
      }
    }
    h1 = Math.imul(h1 ^ 1, 0x01000193) >>> 0;
    h2 = Math.imul(h2 ^ 1, 0x5bd1e995) >>> 0;
  }
  return h1 * 0x100000 + (h2 & 0xfffff);
}

/**
 * Two independent 52-bit hashes of a string (fingerprint52 and a second pair of lanes with other
 * seeds and multipliers): 104 bits, so two different strings share both only with a probability
 * of about n² / 2^105 — about 10^-20 for a million keys.
 */
export function fingerprintPair(s: string): [number, number] {
  let a1 = 0x811c9dc5;
  let a2 = 0x01000193;
  let b1 = 0x9e3779b9;
  let b2 = 0x85ebca6b;
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    a1 = Math.imul(a1 ^ c, 0x01000193) >>> 0;
    a2 = Math.imul(a2 ^ c, 0x5bd1e995) >>> 0;
    b1 = Math.imul(b1 ^ c, 0xcc9e2d51) >>> 0;
    b2 = Math.imul(b2 ^ c, 0x1b873593) >>> 0;
  }
  return [a1 * 0x100000 + (a2 & 0xfffff), b1 * 0x100000 + (b2 & 0xfffff)];
}

/**
 * A map from strings to small integers that keeps only the strings' 104-bit fingerprints
 * (fingerprintPair) in typed arrays: 20 to 40 bytes a key instead of a JavaScript Map's 150
 * or so with the key strings, for the RO numbers of a million-line file.
 */
export class FingerprintMap {
  private keys = new Float64Array(2 << 14);
  private values = new Int32Array(1 << 14);
  private count = 0;

  get size(): number {
    return this.count;
  }

  get(s: string): number | undefined {
    const [a, b] = fingerprintPair(s);
    const at = this.slot(a, b);
    return this.keys[2 * at] === 0 ? undefined : this.values[at];
  }

  /**
   * The value of `s`, or — when `s` is new — sets it to `value` and returns undefined: one hash
   * for what would otherwise be a get and a set.
   */
  getOrSet(s: string, value: number): number | undefined {
    if ((this.count + 1) * 4 > this.values.length * 3) this.grow();
    const [a, b] = fingerprintPair(s);
    const at = this.slot(a, b);
    if (this.keys[2 * at] !== 0) return this.values[at];
    this.fill(at, a, b, value);
    return undefined;
  }

  set(s: string, value: number): void {
    // Up to three quarters full: linear probing stays short, and the table a third smaller.
    if ((this.count + 1) * 4 > this.values.length * 3) this.grow();
    const [a, b] = fingerprintPair(s);
    this.put(a, b, value);
  }

  /** The slot holding (a, b), or the empty slot where it would go. 0 marks an empty slot. */
  private slot(a: number, b: number): number {
    const key = a === 0 ? 1 : a;
    const mask = this.values.length - 1;
    let i = (key % 0x40000000) & mask;
    for (;;) {
      const k = this.keys[2 * i] as number;
      if (k === 0 || (k === key && this.keys[2 * i + 1] === b)) return i;
      i = (i + 1) & mask;
    }
  }

  private put(a: number, b: number, value: number): void {
    const at = this.slot(a, b);
    if (this.keys[2 * at] === 0) this.fill(at, a, b, value);
    else this.values[at] = value;
  }

  /** Puts (a, b) → value into the empty slot `at`. */
  private fill(at: number, a: number, b: number, value: number): void {
    this.keys[2 * at] = a === 0 ? 1 : a;
    this.keys[2 * at + 1] = b;
    this.values[at] = value;
    this.count++;
  }

  private grow(): void {
    const keys = this.keys;
    const values = this.values;
    this.keys = new Float64Array(keys.length * 2);
    this.values = new Int32Array(values.length * 2);
    this.count = 0;
    for (let i = 0; i < values.length; i++) {
      const a = keys[2 * i] as number;
      if (a !== 0) this.put(a, keys[2 * i + 1] as number, values[i] as number);
    }
  }
}
